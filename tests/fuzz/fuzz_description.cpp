// fuzz_description.cpp — libFuzzer harness for the C++ reader of the description format.
//
// The input is taken as the reader's output, bytes as kerf receives them:
// frontend::parseDescription reads the text (the streaming JSON parse and the
// checks of the format, the path `kerf restructure` takes), then it is lowered
// into the network, which walks the expression and statement trees, once
// word-level and once as the proof lowers it. A description kerf cannot read
// must end in an exception (kerf reports it as an internal error), never in a
// crash, a hang or a sanitizer report.
#include "kerf/frontend/lower.h"
#include "kerf/frontend/module.h"

#include <cstddef>
#include <cstdint>
#include <exception>
#include <string_view>

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
    std::string_view text(reinterpret_cast<const char*>(data), size);
    try {
        kerf::frontend::ModuleDesc m = kerf::frontend::parseDescription(text);
        kerf::frontend::Lowered low = kerf::frontend::lower(m);
        kerf::frontend::LowerOptions proofView;
        proofView.bitBlastArithmetic = true;
        kerf::frontend::lower(m, proofView);
    } catch (const std::exception&) {
        // rejected: fine
    }
    return 0;
}
