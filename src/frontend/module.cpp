// module.cpp — running the slang reader and parsing its module description.
#include "kerf/frontend/module.h"

#include <fmt/format.h>

#include <cerrno>
#include <cstdlib>
#include <cstring>
#include <fcntl.h>
#include <spawn.h>
#include <sys/wait.h>
#include <unistd.h>

extern char** environ;

namespace kerf::frontend {

namespace {

constexpr int kFormatVersion = 1;

std::string readerPath() {
    if (const char* p = std::getenv("KERF_READER"); p && *p) return p;
    return KERF_READER_PATH;
}

std::string pythonPath() {
    if (const char* p = std::getenv("KERF_PYTHON"); p && *p) return p;
    return "python3";
}

SourceRange parseRange(const nlohmann::json& j) {
    SourceRange r;
    if (!j.is_object()) return r;
    r.file = j.value("file", "");
    r.start = j.value("start", std::size_t{0});
    r.end = j.value("end", std::size_t{0});
    r.line = j.value("line", 0);
    r.col = j.value("col", 0);
    return r;
}

Signal parseSignal(const nlohmann::json& j) {
    Signal s;
    s.name = j.at("name").get<std::string>();
    s.isVariable = j.value("kind", "net") == "variable";
    s.width = j.value("width", 1);
    s.isSigned = j.value("signed", false);
    s.msb = j.value("msb", s.width - 1);
    s.lsb = j.value("lsb", 0);
    s.vector = j.value("vector", s.width > 1);
    s.src = parseRange(j.value("src", nlohmann::json::object()));
    if (j.contains("direction")) {
        std::string d = j["direction"].get<std::string>();
        s.dir = d == "input" ? PortDir::Input : d == "output" ? PortDir::Output : PortDir::Inout;
    }
    if (j.contains("decl") && j["decl"].is_object()) {
        const auto& d = j["decl"];
        Declarator dc;
        dc.file = d.value("file", "");
        dc.start = d.value("start", std::size_t{0});
        dc.end = d.value("end", std::size_t{0});
        dc.stmtStart = d.value("stmt_start", std::size_t{0});
        dc.stmtEnd = d.value("stmt_end", std::size_t{0});
        dc.count = d.value("count", 1);
        s.decl = dc;
    }
    return s;
}

std::vector<std::string> names(const nlohmann::json& j) {
    std::vector<std::string> v;
    if (j.is_array())
        for (const auto& x : j) v.push_back(x.get<std::string>());
    return v;
}

} // namespace

int Signal::offsetOf(int index) const {
    int off = msb >= lsb ? index - lsb : lsb - index;
    return off >= 0 && off < width ? off : -1;
}

std::string verilogName(const std::string& name) {
    bool simple = !name.empty() && (std::isalpha(static_cast<unsigned char>(name[0])) || name[0] == '_');
    for (char c : name)
        if (!(std::isalnum(static_cast<unsigned char>(c)) || c == '_' || c == '$')) simple = false;
    return simple ? name : "\\" + name + " ";
}

ModuleDesc parseDescription(const nlohmann::json& j) {
    if (j.value("format", "") != "kerf-module")
        throw Error("the reader's output is not a kerf module description", {}, ExitCode::Internal);
    if (j.value("version", 0) != kFormatVersion)
        throw Error(fmt::format("the reader wrote format version {}, this kerf reads version {}",
                                j.value("version", 0), kFormatVersion), {}, ExitCode::Internal);
    ModuleDesc m;
    m.name = j.at("module").at("name").get<std::string>();
    m.src = parseRange(j["module"].value("src", nlohmann::json::object()));
    for (const auto& s : j.at("signals")) {
        Signal sig = parseSignal(s);
        m.signals[sig.name] = std::move(sig);
    }
    for (const auto& p : j.at("ports")) {
        Signal port = parseSignal(p);
        m.portOrder.push_back(port.name);
        auto it = m.signals.find(port.name);
        if (it == m.signals.end()) {
            m.signals[port.name] = port;
        } else {
            it->second.dir = port.dir;
        }
    }
    for (const auto& mj : j.at("members")) {
        Member mem;
        mem.id = mj.value("id", 0);
        std::string kind = mj.at("kind").get<std::string>();
        mem.kind = kind == "assign" ? MemberKind::Assign : kind == "comb" ? MemberKind::Comb : MemberKind::Kept;
        mem.src = parseRange(mj.value("src", nlohmann::json::object()));
        mem.reads = names(mj.value("reads", nlohmann::json::array()));
        mem.writes = names(mj.value("writes", nlohmann::json::array()));
        mem.netDecl = mj.value("net_decl", false);
        mem.what = mj.value("what", "");
        mem.reason = mj.value("reason", "");
        if (mem.kind != MemberKind::Kept) mem.body = mj;
        m.members.push_back(std::move(mem));
    }
    return m;
}

ModuleDesc readModule(const ReadOptions& opts) {
    std::vector<std::string> args{pythonPath(), readerPath()};
    if (!opts.top.empty()) { args.push_back("--top"); args.push_back(opts.top); }
    for (const auto& d : opts.includeDirs) { args.push_back("-I"); args.push_back(d); }
    for (const auto& d : opts.defines) { args.push_back("-D"); args.push_back(d); }
    for (const auto& f : opts.files) {
        auto it = opts.substitute.find(f);
        args.push_back(it == opts.substitute.end() ? f : it->second);
    }

    int pipefd[2];
    if (pipe(pipefd) != 0) throw Error("cannot create a pipe to the reader", {}, ExitCode::Internal);
    posix_spawn_file_actions_t actions;
    posix_spawn_file_actions_init(&actions);
    posix_spawn_file_actions_adddup2(&actions, pipefd[1], STDOUT_FILENO);
    posix_spawn_file_actions_addclose(&actions, pipefd[0]);
    posix_spawn_file_actions_addclose(&actions, pipefd[1]);
    std::vector<char*> argv;
    for (auto& a : args) argv.push_back(a.data());
    argv.push_back(nullptr);
    pid_t pid = 0;
    int rc = posix_spawnp(&pid, argv[0], &actions, nullptr, argv.data(), environ);
    posix_spawn_file_actions_destroy(&actions);
    close(pipefd[1]);
    if (rc != 0) {
        close(pipefd[0]);
        throw Error(fmt::format("cannot start the Verilog reader with '{}': {}. Install Python 3 and run "
                                "'pip install -r requirements.txt' (or set KERF_PYTHON)",
                                args[0], std::strerror(rc)), {}, ExitCode::ToolMissing);
    }
    std::string out;
    char buf[1 << 16];
    for (;;) {
        ssize_t n = read(pipefd[0], buf, sizeof buf);
        if (n < 0 && errno == EINTR) continue;
        if (n <= 0) break;
        out.append(buf, static_cast<std::size_t>(n));
    }
    close(pipefd[0]);
    int status = 0;
    while (waitpid(pid, &status, 0) < 0 && errno == EINTR) {}
    int code = WIFEXITED(status) ? WEXITSTATUS(status) : 128;
    switch (code) {
    case 0: break;
    case 1: throw Error("the design has errors (reported above by slang); nothing was written");
    case 2: throw Error("the reader could not select a module (see above); nothing was written");
    case 3: throw Error("pyslang is not installed: run 'pip install -r requirements.txt'", {}, ExitCode::ToolMissing);
    case 127: throw Error(fmt::format("cannot run '{}': install Python 3 (or set KERF_PYTHON)", args[0]), {}, ExitCode::ToolMissing);
    default:
        throw Error(fmt::format("the Verilog reader failed (exit {}); its messages are above", code), {}, ExitCode::Internal);
    }
    nlohmann::json j;
    try {
        j = nlohmann::json::parse(out);
    } catch (const std::exception& e) {
        throw Error(fmt::format("the reader's output is not valid JSON: {}", e.what()), {}, ExitCode::Internal);
    }
    return parseDescription(j);
}

} // namespace kerf::frontend
