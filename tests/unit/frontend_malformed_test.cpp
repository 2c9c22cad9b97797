// frontend_malformed_test.cpp — descriptions the fuzzer found harmful are rejected, not read out of bounds.
//
// Each tests/fuzz/corpus/description/regression-*.json once made parseDescription
// or lowering read freed memory (AddressSanitizer report from
// tests/fuzz/fuzz_description). A malformed description must end in an
// exception, which kerf reports as an internal error.
#include "kerf/frontend/lower.h"
#include "kerf/frontend/module.h"

#include <gtest/gtest.h>

#include <filesystem>
#include <fstream>
#include <sstream>

namespace {

std::string slurp(const std::filesystem::path& p) {
    std::ifstream in(p, std::ios::binary);
    std::ostringstream ss;
    ss << in.rdbuf();
    return ss.str();
}

} // namespace

TEST(FrontendMalformed, FuzzerRegressionsAreRejected) {
    std::filesystem::path dir = std::filesystem::path(KERF_SOURCE_DIR) / "tests/fuzz/corpus/description";
    int seen = 0;
    for (const auto& e : std::filesystem::directory_iterator(dir)) {
        if (e.path().filename().string().rfind("regression-", 0) != 0) continue;
        ++seen;
        nlohmann::json j = nlohmann::json::parse(slurp(e.path()), nullptr, false);
        ASSERT_FALSE(j.is_discarded()) << e.path();
        EXPECT_THROW(kerf::frontend::lower(kerf::frontend::parseDescription(j)), std::exception) << e.path();
    }
    EXPECT_GT(seen, 0) << "no regression inputs found in " << dir;
}

TEST(FrontendMalformed, MissingKeyIsAnExceptionNotAnOutOfBoundsRead) {
    // A `ref` without its name inside a combinational block's assignment.
    nlohmann::json j = nlohmann::json::parse(R"({"format":"kerf-module","version":1,
        "module":{"name":"m"},"ports":[],"signals":[{"name":"y","width":1}],
        "members":[{"id":0,"kind":"comb","writes":["y"],"reads":[],
                    "body":{"kind":"assign","lhs":{"op":"ref"},"rhs":{"op":"const","bits":"1","width":1}}}]})");
    EXPECT_THROW(kerf::frontend::lower(kerf::frontend::parseDescription(j)), std::exception);
}
