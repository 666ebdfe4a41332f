// Test support for tests/cli: runs the `spinwright` executable with posix_spawn, stdout and
// stderr captured in files of a temporary folder, and reports the exit code (128 + signal when
// it died of a signal). A run that has not ended after `hang_seconds` is killed and reported as
// hung: a behaviour check against hangs, not a timing threshold.
#ifndef SPINWRIGHT_TESTS_SUPPORT_CLI_PROCESS_HPP
#define SPINWRIGHT_TESTS_SUPPORT_CLI_PROCESS_HPP

#include <cerrno>    // errno
#include <chrono>    // std::chrono
#include <cstdio>    // std::fopen
#include <cstdlib>   // std::getenv
#include <fstream>   // std::ifstream, std::ofstream
#include <iterator>  // std::istreambuf_iterator
#include <sstream>   // std::ostringstream
#include <string>    // std::string
#include <thread>    // std::this_thread::sleep_for
#include <vector>    // std::vector

#include <fcntl.h>     // O_WRONLY
#include <signal.h>    // kill, SIGINT, SIGKILL
#include <spawn.h>     // posix_spawn
#include <sys/wait.h>  // waitpid
#include <unistd.h>    // mkdtemp, rmdir

extern char** environ;

namespace cli_test {

struct RunOutput {
  int code = -1;      // exit status, or 128 + signal
  bool hung = false;  // killed after hang_seconds
  std::string out;
  std::string err;
};

inline std::string read_file(const std::string& path) {
  std::ifstream in(path, std::ios::binary);
  return std::string(std::istreambuf_iterator<char>(in), std::istreambuf_iterator<char>());
}

inline void write_file(const std::string& path, const std::string& text) {
  std::ofstream out(path, std::ios::binary);
  out << text;
}

// A fresh folder under $TMPDIR (or /tmp), removed with its files at the end of the scope.
class TempDir {
 public:
  TempDir() {
    const char* base = std::getenv("TMPDIR");
    std::string tmpl = std::string(base != nullptr && *base != '\0' ? base : "/tmp") + "/spinwright-cli-XXXXXX";
    std::vector<char> buf(tmpl.begin(), tmpl.end());
    buf.push_back('\0');
    if (::mkdtemp(buf.data()) != nullptr) path_ = buf.data();
  }
  ~TempDir() {
    for (const auto& f : files_) ::unlink(f.c_str());
    ::rmdir(path_.c_str());
  }
  TempDir(const TempDir&) = delete;
  TempDir& operator=(const TempDir&) = delete;

  bool ok() const { return !path_.empty(); }
  // A path inside the folder (removed at the end).
  std::string file(const std::string& name) {
    const std::string p = path_ + "/" + name;
    files_.push_back(p);
    return p;
  }
  std::string write(const std::string& name, const std::string& text) {
    const std::string p = file(name);
    write_file(p, text);
    return p;
  }

 private:
  std::string path_;
  std::vector<std::string> files_;
};

// Starts `exe args...`; when `interrupt_after` > 0 sends SIGINT that many seconds after start.
// With `stderr_fd` >= 0 the child's stderr is that descriptor (e.g. a pseudo-terminal) instead
// of a file, and RunOutput::err stays empty.
inline RunOutput run_process(const std::string& exe, const std::vector<std::string>& args, TempDir& dir,
                             double interrupt_after = 0, double hang_seconds = 60, int stderr_fd = -1) {
  static int counter = 0;
  ++counter;
  const std::string out_path = dir.file("stdout" + std::to_string(counter));
  const std::string err_path = dir.file("stderr" + std::to_string(counter));
  RunOutput r;
  posix_spawn_file_actions_t actions;
  posix_spawn_file_actions_init(&actions);
  posix_spawn_file_actions_addopen(&actions, 1, out_path.c_str(), O_WRONLY | O_CREAT | O_TRUNC, 0644);
  if (stderr_fd >= 0) {
    posix_spawn_file_actions_adddup2(&actions, stderr_fd, 2);
  } else {
    posix_spawn_file_actions_addopen(&actions, 2, err_path.c_str(), O_WRONLY | O_CREAT | O_TRUNC, 0644);
  }
  posix_spawn_file_actions_addopen(&actions, 0, "/dev/null", O_RDONLY, 0);
  std::vector<std::string> all;
  all.push_back(exe);
  all.insert(all.end(), args.begin(), args.end());
  std::vector<char*> argv;
  for (auto& a : all) argv.push_back(&a[0]);
  argv.push_back(nullptr);
  pid_t pid = 0;
  const int rc = posix_spawn(&pid, exe.c_str(), &actions, nullptr, argv.data(), environ);
  posix_spawn_file_actions_destroy(&actions);
  if (rc != 0) {
    r.err = "posix_spawn failed";
    return r;
  }
  using clock = std::chrono::steady_clock;
  const auto start = clock::now();
  bool interrupted = interrupt_after <= 0;
  int status = 0;
  for (;;) {
    const pid_t w = ::waitpid(pid, &status, WNOHANG);
    if (w == pid) break;
    const double elapsed = std::chrono::duration<double>(clock::now() - start).count();
    if (!interrupted && elapsed >= interrupt_after) {
      ::kill(pid, SIGINT);
      interrupted = true;
    }
    if (elapsed > hang_seconds) {
      ::kill(pid, SIGKILL);
      ::waitpid(pid, &status, 0);
      r.hung = true;
      break;
    }
    std::this_thread::sleep_for(std::chrono::milliseconds(5));
  }
  if (WIFEXITED(status)) r.code = WEXITSTATUS(status);
  if (WIFSIGNALED(status)) r.code = 128 + WTERMSIG(status);
  r.out = read_file(out_path);
  if (stderr_fd < 0) r.err = read_file(err_path);
  return r;
}

}  // namespace cli_test

#endif  // SPINWRIGHT_TESTS_SUPPORT_CLI_PROCESS_HPP
