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

// The temporary files of writes in progress, for a signal handler: fixed
// slots, so remove_unfinished_reports neither allocates nor locks. A write
// that finds no free slot (more than kTemporarySlots files at once, or a
// longer path) still works; only a signal may then leave its file behind.
constexpr size_t kTemporarySlots = 32;
constexpr size_t kTemporaryPathBytes = 4096;
enum SlotState : int { kSlotFree, kSlotFilling, kSlotListed };
struct TemporarySlot {
  std::atomic<int> state{kSlotFree};
  char path[kTemporaryPathBytes];
};
TemporarySlot temporary_slots[kTemporarySlots];

int remember_temporary(const std::string& path) {
  if (path.size() >= kTemporaryPathBytes) return -1;
  for (size_t i = 0; i < kTemporarySlots; ++i) {
    int expected = kSlotFree;
    if (!temporary_slots[i].state.compare_exchange_strong(expected, kSlotFilling)) continue;
    std::memcpy(temporary_slots[i].path, path.c_str(), path.size() + 1);
    temporary_slots[i].state.store(kSlotListed);
    return static_cast<int>(i);
  }
  return -1;
}

void forget_temporary(int slot) {
  if (slot >= 0) temporary_slots[slot].state.store(kSlotFree);
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
    std::string temporary;
    int slot;  // in the signal handler's list, or -1
  };
  std::vector<Staged> staged;
  // Every way out (a failure, an exception such as bad_alloc) removes the
  // temporary files not yet renamed; a signal is handled by
  // remove_unfinished_reports.
  struct Discard {
    std::vector<Staged>& staged;
    ~Discard() {
      for (const Staged& s : staged) {
        if (!s.temporary.empty()) ::unlink(s.temporary.c_str());
        forget_temporary(s.slot);
      }
    }
  } discard{staged};
  for (const auto& [path, text] : files) {
    struct stat info;
    bool special = ::stat(path.c_str(), &info) == 0 && !S_ISREG(info.st_mode);
    int fd;
    if (special) {
      fd = ::open(path.c_str(), O_WRONLY | O_TRUNC | O_CLOEXEC);
    } else {
      std::filesystem::path p(path);
      std::string temporary =
          (p.parent_path() / ("." + p.filename().string() + ".tmp-" + std::to_string(::getpid()) +
                              "-" + std::to_string(counter.fetch_add(1))))
              .string();
      // Listed before it exists, so no signal finds it unlisted.
      staged.push_back({path, temporary, remember_temporary(temporary)});
      fd = ::open(temporary.c_str(), O_WRONLY | O_CREAT | O_EXCL | O_CLOEXEC, 0644);
      if (fd < 0) staged.back().temporary.clear();  // not ours to remove
    }
    if (fd < 0) return "cannot write " + path + ": " + std::strerror(errno);
    std::string reason = write_all(fd, text);
    if (::close(fd) != 0 && reason.empty()) reason = std::strerror(errno);
    if (!reason.empty()) return "cannot write " + path + ": " + reason;
  }
  for (Staged& s : staged) {
    if (::rename(s.temporary.c_str(), s.path.c_str()) != 0) {
      return "cannot write " + s.path + ": " + std::strerror(errno);
    }
    s.temporary.clear();
    forget_temporary(s.slot);
    s.slot = -1;
  }
  return "";
}

void remove_unfinished_reports() noexcept {
  for (TemporarySlot& slot : temporary_slots) {
    if (slot.state.load() == kSlotListed) ::unlink(slot.path);
  }
}

}  // namespace thetagate::engine
