#include "verifier/model/claim_discovery.h"

#include <sys/stat.h>

#include <algorithm>
#include <filesystem>
#include <set>
#include <utility>

#include "verifier/syntax/source.h"

namespace thetagate::engine {

namespace {

ClaimEntry file_error(const std::string& path, std::string message, std::string hint) {
  ClaimEntry entry;
  entry.where = Location{path, 1, 1};
  entry.error = Diagnostic{entry.where, std::move(message), std::move(hint), ""};
  return entry;
}

// Every *.toml below `folder` (not following links to folders), and an
// error entry for each part of the tree that cannot be read: an unlistable
// folder, a link loop or dangling link named *.toml. The rest is still found.
void walk_folder(const std::string& folder, std::vector<std::string>& found,
                 std::vector<ClaimEntry>& problems) {
  namespace fs = std::filesystem;
  auto problem = [&problems](const fs::path& where, const std::string& what,
                             const std::error_code& ec) {
    problems.push_back(file_error(where.string(), what + ": " + ec.message(),
                                  "fix or remove this entry; the other claim files are checked"));
  };
  std::vector<fs::path> pending{fs::path(folder)};
  while (!pending.empty()) {
    fs::path dir = std::move(pending.back());
    pending.pop_back();
    std::error_code ec;
    fs::directory_iterator it(dir, ec);
    if (ec) {
      problem(dir, "cannot list the folder '" + dir.string() + "'", ec);
      continue;
    }
    for (; it != fs::directory_iterator(); it.increment(ec)) {
      const fs::directory_entry& entry = *it;
      std::error_code kind_ec;
      fs::file_status own = entry.symlink_status(kind_ec);
      if (!kind_ec && fs::is_directory(own)) {
        pending.push_back(entry.path());
        continue;
      }
      if (entry.path().extension() != ".toml") continue;
      fs::file_status target = entry.status(kind_ec);
      if (kind_ec) {
        problem(entry.path(), "cannot read '" + entry.path().string() + "'", kind_ec);
      } else if (fs::is_regular_file(target)) {
        found.push_back(entry.path().string());
      }
    }
    if (ec) problem(dir, "cannot list the folder '" + dir.string() + "'", ec);
  }
}

}  // namespace

std::vector<std::string> find_claim_files(const std::vector<std::string>& paths,
                                          std::vector<ClaimEntry>* unreadable) {
  namespace fs = std::filesystem;
  std::vector<std::string> files;
  // A file named twice (a.toml ./a.toml, a folder and a file in it, a link
  // to it) is read once, as first named: the same claims twice would be a
  // duplicate-name error. Files are the same when the system says so (device
  // and inode), else when their normalised spellings are.
  std::set<std::pair<dev_t, ino_t>> seen_ids;
  std::set<std::string> seen_paths;
  auto add = [&](const std::string& f) {
    struct stat info;
    bool fresh = ::stat(f.c_str(), &info) == 0
                     ? seen_ids.emplace(info.st_dev, info.st_ino).second
                     : seen_paths.insert(fs::path(f).lexically_normal().string()).second;
    if (fresh) files.push_back(f);
  };
  for (const std::string& path : paths) {
    std::error_code ec;
    fs::file_status status = fs::status(path, ec);
    if (ec && ec != std::errc::no_such_file_or_directory) {
      throw InputError(Diagnostic{Location{path, 1, 1},
                                  "cannot reach '" + path + "': " + ec.message(),
                                  "check the permissions of the folders on the way to it", ""});
    }
    if (!fs::exists(status)) {
      throw InputError(Diagnostic{Location{path, 1, 1}, "no such file or folder: '" + path + "'",
                                  "give claim files (*.toml) or folders holding them; the default "
                                  "is claims/",
                                  ""});
    }
    if (!fs::is_directory(status)) {
      add(path);
      continue;
    }
    std::vector<std::string> found;
    std::vector<ClaimEntry> problems;
    walk_folder(path, found, problems);
    if (found.empty() && problems.empty()) {
      problems.push_back(file_error(path, "no claim files (*.toml) in the folder '" + path + "'",
                                    "give a folder holding claim files, or the files themselves"));
    }
    if (!problems.empty() && !unreadable) throw InputError(*problems.front().error);
    if (unreadable) unreadable->insert(unreadable->end(), problems.begin(), problems.end());
    std::sort(found.begin(), found.end());
    for (const std::string& f : found) add(f);
  }
  return files;
}

}  // namespace thetagate::engine
