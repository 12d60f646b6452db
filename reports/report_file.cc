#include "reports/report_file.h"

#include <fcntl.h>
#include <sys/stat.h>
#include <unistd.h>

#include <atomic>
#include <cerrno>
#include <cstring>
#include <filesystem>

namespace thetagate::engine {

namespace {

[[noreturn]] void fail_output(const std::string& out, std::string message, std::string hint) {
  throw InputError(Diagnostic{Location{out, 1, 1}, std::move(message), std::move(hint), ""});
}

// Writes all of `text` to `fd`; "" or the system's reason.
std::string write_all(int fd, const std::string& text) {
  size_t done = 0;
  while (done < text.size()) {
    ssize_t wrote = ::write(fd, text.data() + done, text.size() - done);
    if (wrote < 0 && errno == EINTR) continue;
    if (wrote < 0) return std::strerror(errno);
    done += static_cast<size_t>(wrote);
  }
  return "";
}

std::string folder_of(const std::string& path) {
  std::string parent = std::filesystem::path(path).parent_path().string();
  return parent.empty() ? "." : parent;
}

}  // namespace

void check_output_location(const std::string& out, bool folder) {
  const std::string hint = "--out takes a file, or a folder (existing, or ending in '/')";
  std::string dir = folder ? out : folder_of(out);
  if (folder) {
    std::error_code ec;
    std::filesystem::create_directories(out, ec);
    if (ec)
      fail_output(out, "cannot create the report folder '" + out + "': " + ec.message(), hint);
  }
  struct stat info;
  if (::stat(dir.c_str(), &info) != 0) {
    fail_output(out, "cannot write reports into '" + dir + "': " + std::strerror(errno), hint);
  }
  if (!S_ISDIR(info.st_mode)) {
    fail_output(out, "cannot write reports into '" + dir + "': it is not a folder", hint);
  }
  if (::access(dir.c_str(), W_OK | X_OK) != 0) {
    fail_output(out, "cannot write reports into '" + dir + "': " + std::strerror(errno), hint);
  }
}

std::string write_files_whole(const std::vector<std::pair<std::string, std::string>>& files) {
  static std::atomic<unsigned> counter{0};
  struct Staged {
    std::string path;
    std::string temporary;  // empty: written in place
  };
  std::vector<Staged> staged;
  auto discard = [&staged] {
    for (const Staged& s : staged) {
      if (!s.temporary.empty()) ::unlink(s.temporary.c_str());
    }
  };
  for (const auto& [path, text] : files) {
    struct stat info;
    bool special = ::stat(path.c_str(), &info) == 0 && !S_ISREG(info.st_mode);
    std::string target = path;
    int fd;
    if (special) {
      fd = ::open(path.c_str(), O_WRONLY | O_TRUNC | O_CLOEXEC);
    } else {
      std::filesystem::path p(path);
      target =
          (p.parent_path() / ("." + p.filename().string() + ".tmp-" + std::to_string(::getpid()) +
                              "-" + std::to_string(counter.fetch_add(1))))
              .string();
      fd = ::open(target.c_str(), O_WRONLY | O_CREAT | O_EXCL | O_CLOEXEC, 0644);
    }
    if (fd < 0) {
      std::string reason = std::strerror(errno);
      discard();
      return "cannot write " + path + ": " + reason;
    }
    if (!special) staged.push_back({path, target});
    std::string reason = write_all(fd, text);
    if (::close(fd) != 0 && reason.empty()) reason = std::strerror(errno);
    if (!reason.empty()) {
      discard();
      return "cannot write " + path + ": " + reason;
    }
  }
  for (size_t i = 0; i < staged.size(); ++i) {
    if (::rename(staged[i].temporary.c_str(), staged[i].path.c_str()) != 0) {
      std::string reason = std::strerror(errno);
      for (size_t j = i; j < staged.size(); ++j) ::unlink(staged[j].temporary.c_str());
      return "cannot write " + staged[i].path + ": " + reason;
    }
  }
  return "";
}

}  // namespace thetagate::engine
