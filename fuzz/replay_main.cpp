// Replays inputs through a harness without libFuzzer, so the seeds and every crash input found
// run as regression tests under any compiler and sanitizer preset: each argument is a file or a
// directory (its regular files, sorted; dot files and README* skipped), each file is passed once
// to LLVMFuzzerTestOneInput. A property violation aborts (fuzz_support.hpp), failing the test.
#include <algorithm>
#include <cstddef>
#include <cstdint>
#include <cstdio>
#include <filesystem>
#include <fstream>
#include <iterator>
#include <string>
#include <vector>

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size);

int main(int argc, char** argv) {
  namespace fs = std::filesystem;
  std::vector<fs::path> files;
  for (int i = 1; i < argc; ++i) {
    const fs::path arg(argv[i]);
    if (fs::is_directory(arg)) {
      for (const fs::directory_entry& e : fs::directory_iterator(arg)) {
        const std::string name = e.path().filename().string();
        if (e.is_regular_file() && name.rfind('.', 0) != 0 && name.rfind("README", 0) != 0) {
          files.push_back(e.path());
        }
      }
    } else if (fs::is_regular_file(arg)) {
      files.push_back(arg);
    } else {
      std::fprintf(stderr, "replay: no such file or directory: %s\n", argv[i]);
      return 2;
    }
  }
  std::sort(files.begin(), files.end());
  if (files.empty()) {
    std::fprintf(stderr, "replay: no inputs\n");
    return 2;
  }
  for (const fs::path& f : files) {
    std::ifstream in(f, std::ios::binary);
    const std::vector<char> bytes((std::istreambuf_iterator<char>(in)),
                                  std::istreambuf_iterator<char>());
    if (!in.good() && !in.eof()) {
      std::fprintf(stderr, "replay: cannot read %s\n", f.string().c_str());
      return 2;
    }
    std::printf("replay: %s (%zu bytes)\n", f.string().c_str(), bytes.size());
    std::fflush(stdout);
    // An empty vector's data() may be null; the harnesses accept (nullptr, 0) as libFuzzer does.
    LLVMFuzzerTestOneInput(reinterpret_cast<const std::uint8_t*>(bytes.data()), bytes.size());
  }
  std::printf("replay: %zu inputs, no crash, no property violation\n", files.size());
  return 0;
}
