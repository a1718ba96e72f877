#include "cli/output_file.h"

#include <sys/stat.h>
#include <unistd.h>

#include <cstdio>
#include <filesystem>
#include <fstream>
#include <iostream>

#include "core/corpus.h"
#include "core/error.h"
#include "standoff/safe_file.h"

namespace manicule::cli {

namespace fs = std::filesystem;

namespace {

// `append`: for a descriptor's path, which reopens the file behind it; truncating it would
// take away what the shell or the job wrote there before (a log opened with >>).
void write_in_place(const std::string& path, const std::function<void(std::ostream&)>& write, bool append = false) {
  std::ofstream out(path, append ? std::ios::binary | std::ios::app : std::ios::binary);
  if (!out) throw Error(ErrorKind::write_failed, "cannot open the output for writing", path);
  write(out);
  out.flush();
  if (!out) throw Error(ErrorKind::write_failed, "cannot write the output", path);
}

}  // namespace

void write_output(const std::string& path, const std::function<void(std::ostream&)>& write) {
  if (path.empty() || path == "-") {
    write(std::cout);
    std::cout.flush();
    return;
  }
  if (names_a_descriptor_or_device(path)) return write_in_place(path, write, true);
  std::error_code ec;
  std::string target = path;
  if (fs::is_symlink(fs::symlink_status(path, ec))) {
    target = fs::canonical(path, ec).string();
    if (ec) return write_in_place(path, write);  // a link to nothing yet: written through, as before
  }
  const fs::file_status status = fs::status(target, ec);
  if (fs::exists(status) && !fs::is_regular_file(status)) return write_in_place(path, write);
  const fs::path folder = fs::path(target).parent_path();
  if (!folder.empty() && !fs::is_directory(folder, ec))
    throw Error(ErrorKind::write_failed, "cannot write the output: the folder " + folder.string() + " does not exist",
                path);

  const std::string temporary = temporary_path_for(target, static_cast<long>(::getpid()));
  std::ofstream out(temporary, std::ios::binary | std::ios::trunc);
  if (!out) return write_in_place(path, write);
  try {
    write(out);
    out.flush();
    if (!out) throw Error(ErrorKind::write_failed, "cannot write the output (is the disk full?); it is as it was", path);
    out.close();
    struct stat st {};
    if (::stat(target.c_str(), &st) == 0) ::chmod(temporary.c_str(), st.st_mode & 07777);
    if (std::rename(temporary.c_str(), target.c_str()) != 0)
      throw Error(ErrorKind::write_failed, "cannot put the new output in place; it is as it was", path);
  } catch (...) {
    out.close();
    std::remove(temporary.c_str());
    throw;
  }
}

void refuse_output_over_input(const std::string& output, const std::vector<std::string>& inputs) {
  std::error_code ec;
  if (output.empty() || output == "-" || names_a_descriptor_or_device(output) || !fs::exists(output, ec)) return;
  for (const std::string& input : expand_inputs(inputs))
    if (fs::equivalent(output, input, ec))
      throw Error(ErrorKind::usage, "--output " + output + " is one of the inputs (" + input +
                                        "): the results would take the place of the edition; write them elsewhere");
}

}  // namespace manicule::cli
