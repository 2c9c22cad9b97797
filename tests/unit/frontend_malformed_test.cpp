// frontend_malformed_test.cpp — the description harness's corpus is readable, and what the fuzzer found harmful is rejected.
//
// Each tests/fuzz/corpus/description/regression-*.json once made parseDescription
// or lowering read freed memory (AddressSanitizer report from
// tests/fuzz/fuzz_description) or run for minutes (a libFuzzer timeout). A malformed description must end in an
// exception, which kerf reports as an internal error — and it must be rejected
// for its damage, not for an old format version (tests/fuzz/refresh_corpus.py
// writes the corpus in the current format).
#include "kerf/frontend/lower.h"
#include "kerf/frontend/module.h"

#include <gtest/gtest.h>

#include <filesystem>
#include <fstream>
#include <sstream>
#include <string>

namespace {

std::string slurp(const std::filesystem::path& p) {
    std::ifstream in(p, std::ios::binary);
    std::ostringstream ss;
    ss << in.rdbuf();
    return ss.str();
}

std::filesystem::path corpusDir() {
    return std::filesystem::path(KERF_SOURCE_DIR) / "tests/fuzz/corpus/description";
}

bool isRegression(const std::filesystem::path& p) {
    return p.filename().string().rfind("regression-", 0) == 0;
}

/// The message of the exception reading and lowering `j` throws, or "" when it reads.
std::string rejection(const nlohmann::json& j) {
    try {
        kerf::frontend::lower(kerf::frontend::parseDescription(j));
    } catch (const std::exception& e) {
        return std::string("rejected: ") + e.what();
    }
    return "";
}

} // namespace

TEST(FrontendMalformed, SeedCorpusIsInTheFormatKerfReads) {
    int seen = 0;
    for (const auto& e : std::filesystem::directory_iterator(corpusDir())) {
        if (e.path().extension() != ".json" || isRegression(e.path())) continue;
        ++seen;
        nlohmann::json j = nlohmann::json::parse(slurp(e.path()), nullptr, false);
        ASSERT_FALSE(j.is_discarded()) << e.path();
        EXPECT_NO_THROW(kerf::frontend::parseDescription(j))
            << e.path() << " (run tests/fuzz/refresh_corpus.py after a change of the description format)";
    }
    EXPECT_GT(seen, 20) << "seed corpus missing in " << corpusDir();
}

TEST(FrontendMalformed, FuzzerRegressionsAreRejectedForTheirDamage) {
    int seen = 0;
    for (const auto& e : std::filesystem::directory_iterator(corpusDir())) {
        if (!isRegression(e.path())) continue;
        ++seen;
        nlohmann::json j = nlohmann::json::parse(slurp(e.path()), nullptr, false);
        ASSERT_FALSE(j.is_discarded()) << e.path();
        std::string why = rejection(j);
        EXPECT_NE(why, "") << e.path() << " was read without complaint";
        EXPECT_EQ(why.find("format version"), std::string::npos) << e.path() << ": " << why;
    }
    EXPECT_GT(seen, 0) << "no regression inputs found in " << corpusDir();
}

TEST(FrontendMalformed, ReferenceWithoutSignalIsAnExceptionNotAnOutOfBoundsRead) {
    nlohmann::json j = nlohmann::json::parse(slurp(corpusDir() / "two_drivers.json"));
    ASSERT_EQ(rejection(j).find("format version"), std::string::npos);
    bool damaged = false;
    for (auto& row : j["exprs"]) {
        if (row.is_array() && !row.empty() && row[0] == "ref") {
            row.erase(row.size() - 1);   // the signal index
            damaged = true;
            break;
        }
    }
    ASSERT_TRUE(damaged);
    std::string why = rejection(j);
    EXPECT_NE(why, "");
    EXPECT_EQ(why.find("format version"), std::string::npos) << why;
}

// F147: the JSON parser takes a NUL byte for the end of its input, so a whole description
// followed by a NUL and more was read as if the rest were not there.
TEST(FrontendMalformed, NulByteAnywhereIsRefusedWithItsPlace) {
    const std::string good = slurp(corpusDir() / "two_drivers.json");
    ASSERT_NO_THROW(kerf::frontend::parseDescription(good));
    const std::size_t end = good.find_last_of('}') + 1;
    for (std::size_t at : {std::size_t{0}, good.size() / 3, end - 1, end}) {
        std::string bad = good.substr(0, at) + std::string(1, '\0') + good.substr(at);
        try {
            kerf::frontend::parseDescription(bad);
            ADD_FAILURE() << "a NUL before byte " << at << " was read without complaint";
        } catch (const kerf::Error& e) {
            EXPECT_EQ(e.code(), kerf::ExitCode::Internal);
            EXPECT_NE(std::string(e.what()).find("at byte " + std::to_string(at + 1)), std::string::npos) << e.what();
        }
    }
}
