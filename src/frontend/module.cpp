// module.cpp — the module description: reading it through the slang reader (kerf/io/reader.h) and parsing it.
#include "kerf/frontend/module.h"

#include "kerf/io/files.h"
#include "kerf/io/reader.h"

#include <fmt/format.h>

#include <cctype>

namespace kerf::frontend {

namespace {

constexpr int kFormatVersion = 1;

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
        mem.matchKey = mj.value("match_key", "");
        mem.params = names(mj.value("parameters", nlohmann::json::array()));
        if (mem.kind != MemberKind::Kept) mem.body = mj;
        m.members.push_back(std::move(mem));
    }
    for (const auto& pj : j.value("parameters", nlohmann::json::array())) {
        Parameter p;
        p.name = pj.at("name").get<std::string>();
        p.isType = pj.value("kind", "value") == "type";
        p.pinned = pj.value("pinned", false);
        p.value = pj.value("value", "");
        p.literal = pj.value("literal", "");
        p.implicitType = pj.value("implicit_type", false);
        p.keptMembers = pj.value("members", 0);
        p.src = parseRange(pj.value("src", nlohmann::json::object()));
        m.parameters.push_back(std::move(p));
    }
    for (const auto& cj : j.value("conditionals", nlohmann::json::array()))
        m.conditionals.push_back(fmt::format("{}:{}: {}", cj.value("file", "?"), cj.value("line", 0),
                                             cj.value("text", "")));
    if (auto pm = j.find("port_members"); pm != j.end() && pm->is_object())
        for (const auto& [port, list] : pm->items())
            for (const auto& e : list)
                m.portMembers[port].push_back({e.at("name").get<std::string>(), e.value("offset", 0), e.value("width", 1)});
    return m;
}

std::vector<std::string> readerArguments(const ReadOptions& opts) {
    std::vector<std::string> args;
    if (!opts.top.empty()) { args.push_back("--top"); args.push_back(opts.top); }
    for (const auto& d : opts.includeDirs) { args.push_back("-I"); args.push_back(d); }
    for (const auto& d : opts.defines) { args.push_back("-D"); args.push_back(d); }
    for (const auto& p : opts.params) { args.push_back("--param"); args.push_back(p); }
    if (opts.asBuilt) args.push_back("--as-built");
    for (const auto& f : opts.files) {
        auto it = opts.substitute.find(f);
        args.push_back(it == opts.substitute.end() ? f : it->second);
    }
    return args;
}

ModuleDesc readModule(const ReadOptions& opts) {
    for (const auto& f : opts.files) {
        auto it = opts.substitute.find(f);
        io::checkSourceFile(it == opts.substitute.end() ? f : it->second);
    }
    io::ReaderOutput out = io::runReader(readerArguments(opts));
    try {
        return parseDescription(nlohmann::json::parse(out.text));
    } catch (const std::exception& e) {
        // The reader is ours: whatever it printed that we cannot read is kerf's bug.
        std::string saved = io::saveBugReport({{"reader-output.json", out.text}});
        std::string where = saved.empty() ? "" : fmt::format("; its output is saved in {}/ for a bug report", saved);
        std::string why = dynamic_cast<const Error*>(&e) ? e.what() : fmt::format("malformed description: {}", e.what());
        throw Error(fmt::format("the Verilog reader's output cannot be read ({}){}; nothing was written. "
                                "This is a kerf bug: please report it", why, where), {}, ExitCode::Internal);
    }
}

} // namespace kerf::frontend
