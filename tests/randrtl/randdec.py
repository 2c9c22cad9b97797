"""randdec — a seeded generator of random control decoders, the shape kerf is built for.

Where randmod.py draws modules of every construct in odd combinations, randdec draws the modules
RTL engineers hand kerf: an operation code (and a function field, a mode, a valid) decoded by one
`always_comb` or `always @(*)` block into control outputs, in the styles hand-written and
table-generated decoders use (common trade practice):
- one in five a table-generated size (24-60 codes of 7-8 bits, up to 14 outputs);
- named codes as localparams or from a package, items with several labels, `casez`/`casex`
  items with wildcard bits, `unique`/`priority` qualifiers (unique only over items that do not
  overlap), a default that flags the code illegal or assigns x (a don't-care);
- defaults at the top of the block, then per item constants, fields copied or decoded from the
  function field (`{1'b0, fn}`, `fn == 2'd1 ? ... : ...`), a nested `case (fn)`, an `if` on the
  mode;
- control fields as vectors, an output struct with an enum member assigned by name, and
  statements after the block that combine the decoded signals (`legal = valid & ~illegal`) or
  repeat the decode in sum-of-products style, as table generators emit.

The same (seed, index) always gives the same text. The description has the format of
randmod.generate's, so campaign.py compares the two kinds alike:

    python3 tests/randrtl/randdec.py --seed 7 --index 42
"""
import argparse
import random

# Constructs a decoder draws from (for the campaign's coverage counts).
CONSTRUCTS = ("casez", "casex", "unique", "priority", "xdefault", "package", "struct", "enum",
              "nested", "multilabel", "alwaysstar", "sop", "big")


class DecoderGen:
    def __init__(self, seed, index):
        self.rng = random.Random(f"kerf-randdec-{seed}-{index}")
        self.name = f"rd_{seed}_{index}"
        self.pkg = f"{self.name}_pkg"
        self.used = set()

    def const(self, width, value):
        style = self.rng.random()
        if style < 0.4:
            return f"{width}'d{value}"
        if style < 0.7:
            return f"{width}'h{value:x}"
        return f"{width}'b{value:0{width}b}"

    def generate(self):
        rng = self.rng
        w_op = rng.choice([4, 5, 6, 7, 7, 8])
        w_fn = rng.choice([2, 3])
        has_mode = rng.random() < 0.5
        style = rng.choice(["case", "case", "casez", "casez", "casex"])
        qualifier = rng.choice(["", "", "unique ", "priority "])
        use_pkg = rng.random() < 0.4    # (a module with a struct port always takes a package)
        star = rng.random() < 0.25
        if style != "case":
            self.used.add(style)
        if star:
            self.used.add("alwaysstar")
        # ---- codes: distinct values, some as wildcard patterns
        big = rng.random() < 0.2        # a table-generated decoder: many codes, many outputs
        if big:
            w_op = rng.choice([7, 8])
            self.used.add("big")
        n_codes = rng.randint(4, min(14, (1 << w_op) // 2)) if not big else rng.randint(24, 60)
        values = rng.sample(range(1 << w_op), n_codes)
        names = [f"OP_{chr(65 + i)}" if i < 26 else f"OP_{i}" for i in range(n_codes)]
        patterns = []      # per code: bit string with '?' (or 'x') wildcards, or None for the plain value
        wild = "x" if style == "casex" else "?"
        for v in values:
            bits = f"{v:0{w_op}b}"
            if style != "case" and rng.random() < 0.35:
                k = rng.randint(1, 2)
                pos = rng.sample(range(w_op), k)
                bits = "".join(wild if i in pos else b for i, b in enumerate(bits))
            patterns.append(bits if wild in bits else None)

        def covers(p, v):
            bits = f"{v:0{w_op}b}"
            return all(a == b or a == wild for a, b in zip(p, bits))

        def overlap(i, j):
            pi = patterns[i] or f"{values[i]:0{w_op}b}"
            pj = patterns[j] or f"{values[j]:0{w_op}b}"
            return all(a == b or wild in (a, b) for a, b in zip(pi, pj))

        if qualifier == "unique ":
            # unique only over items that cannot both match (IEEE 1800-2017 12.5.3)
            keep = []
            for i in range(n_codes):
                if all(not overlap(i, j) for j in keep):
                    keep.append(i)
            values = [values[i] for i in keep]
            names = [names[i] for i in keep]
            patterns = [patterns[i] for i in keep]
            n_codes = len(keep)
        if qualifier:
            self.used.add(qualifier.strip())
        # ---- outputs
        outs = []          # (name, width)
        for i in range(rng.randint(2, 5) + (6 if big else 0)):
            outs.append((rng.choice(["wr_en", "rd_en", "use_imm", "br", "jmp", "stall", "fwd", "trap"])
                         + f"{i}", 1))
        for i in range(rng.randint(1, 3) + (3 if big else 0)):
            outs.append((rng.choice(["alu_op", "imm_sel", "src_sel", "size"]) + f"{i}",
                         rng.choice([2, 3, 4])))
        struct = None
        if rng.random() < 0.4:
            self.used.add("struct")
            kinds = ["K_NONE", "K_MEM", "K_ALU", "K_CTL"]
            with_enum = rng.random() < 0.5
            struct = {"enum": with_enum, "kinds": kinds,
                      "members": [("go", 1), ("unit", 2)] + ([("kind", 2)] if with_enum else [("sub", 1)])}
            if with_enum:
                self.used.add("enum")
            # the port's types must be known before the port list, and the campaign compiles
            # the original and the rewrite together: types in a package, renamed per copy
            use_pkg = True
        x_defaults = {n for n, w in outs if w > 1 and rng.random() < 0.3}
        if x_defaults:
            self.used.add("xdefault")
        # ---- text
        L = []
        pkg_lines = []
        code_decls = [f"localparam logic [{w_op - 1}:0] {n} = {self.const(w_op, v)};"
                      for n, v, p in zip(names, values, patterns) if p is None]
        if use_pkg:
            self.used.add("package")
            pkg_lines = [f"package {self.pkg};"] + ["  " + d for d in code_decls] + ["endpackage", ""]
        ports = [("op", "in", w_op), ("fn", "in", w_fn), ("valid", "in", 1)]
        if has_mode:
            ports.append(("mode", "in", 2))
        ports += [(n, "out", w) for n, w in outs]
        if struct:
            ports.append(("ctl", "out", sum(w for _, w in struct["members"])))
        ports.append(("legal", "out", 1))
        L.append(f"module {self.name} (")
        plines = []
        for n, d, w in ports:
            if n == "ctl":
                plines.append(f"  output ctl_t {n}")
            else:
                rng_txt = f"[{w - 1}:0] " if w > 1 else ""
                plines.append(f"  {'input ' if d == 'in' else 'output'} logic {rng_txt}{n}")
        typedefs = []
        if struct:
            if struct["enum"]:
                typedefs.append("typedef enum logic [1:0] { " +
                                ", ".join(f"{k} = 2'd{i}" for i, k in enumerate(struct["kinds"])) + " } kind_e;")
            members = " ".join(f"{'kind_e' if m == 'kind' else ('logic' if w == 1 else f'logic [{w - 1}:0]')} {m};"
                               for m, w in struct["members"])
            typedefs.append(f"typedef struct packed {{ {members} }} ctl_t;")
        if struct:
            pkg_lines = pkg_lines[:-2] + ["  " + t for t in typedefs] + pkg_lines[-2:]
        if use_pkg:
            L[-1] = f"module {self.name}\n  import {self.pkg}::*;\n("
        L.append(",\n".join(plines))
        L.append(");")
        if not use_pkg:
            L += ["  " + d for d in code_decls]
        L.append("  logic illegal;")
        head = "always @(*) begin" if star else "always_comb begin"
        L.append(f"  {head}")
        L.append("    illegal = 1'b0;")
        for n, w in outs:
            if n in x_defaults:
                L.append(f"    {n} = 'x;")
            else:
                L.append(f"    {n} = {self.const(w, 0) if w > 1 else ('1' + chr(39) + 'b0')};")
        if struct:
            L.append("    ctl = '0;")
            if struct["enum"]:
                L.append("    ctl.kind = K_NONE;")
        L.append(f"    {qualifier}{style} (op)")
        # group codes: some items take two labels
        items = []
        i = 0
        while i < n_codes:
            if i + 1 < n_codes and rng.random() < 0.2:
                items.append([i, i + 1])
                self.used.add("multilabel")
                i += 2
            else:
                items.append([i])
                i += 1
        for item in items:
            labels = ", ".join(names[k] if patterns[k] is None else f"{w_op}'b{patterns[k]}" for k in item)
            body = self.item_body(outs, struct, w_fn, has_mode)
            if len(body) == 1:
                L.append(f"      {labels}: {body[0].strip()}")
            else:
                L.append(f"      {labels}: begin")
                L += ["        " + b for b in body]
                L.append("      end")
        d = rng.random()
        if d < 0.5:
            L.append("      default: illegal = 1'b1;")
        elif d < 0.8:
            self.used.add("xdefault")
            L.append("      default: begin")
            L.append("        illegal = 1'b1;")
            for n, w in outs:
                if w > 1 and rng.random() < 0.5:
                    L.append(f"        {n} = 'x;")
            L.append("      end")
        else:
            L.append("      default: begin")
            L.append("        illegal = 1'b1;")
            n, w = rng.choice(outs)
            L.append(f"        {n} = {'1' + chr(39) + 'b1' if w == 1 else self.const(w, (1 << w) - 1)};")
            L.append("      end")
        L.append("    endcase")
        L.append("  end")
        # ---- statements after the block
        guard = rng.choice(["valid & ~illegal", "valid && !illegal", "~illegal & valid"])
        if has_mode and rng.random() < 0.4:
            guard += " & ~(mode == 2'b11)"
        L.append(f"  assign legal = {guard};")
        internals = [{"name": "illegal", "width": 1}]
        if rng.random() < 0.5:
            # a second decode of some codes in the sum-of-products style generators emit
            self.used.add("sop")
            picks = rng.sample(range(n_codes), min(n_codes, rng.randint(2, 4)))
            terms = []
            for k in picks:
                if patterns[k] is None:
                    t = f"(op == {names[k]})"
                else:
                    lits = [f"{'' if b == '1' else '~'}op[{w_op - 1 - j}]"
                            for j, b in enumerate(patterns[k]) if b in "01"]
                    t = "(" + " & ".join(lits) + ")"
                if rng.random() < 0.4:
                    t = f"({t[1:-1]} & fn[{rng.randrange(w_fn)}])"
                terms.append(t)
            L.append("  logic hit_any;")
            L.append(f"  assign hit_any = {' | '.join(terms)};")
            internals.append({"name": "hit_any", "width": 1})
        L.append("endmodule")
        L.append("")
        text = "\n".join(pkg_lines + L)
        desc = {
            "name": self.name,
            "ports": [{"name": n, "dir": d, "width": w, "signed": False} for n, d, w in ports],
            "internals": internals,
            "clock": None,
            "reset": None,
            "param_sets": [[]],
            "constructs": sorted(self.used),
            "package": self.pkg if use_pkg else None,
            # random vectors: enough that most codes of a big table are met
            "vectors": 2000 if "big" in self.used else 600,
        }
        return text, desc

    def item_body(self, outs, struct, w_fn, has_mode):
        """Assignments of one case item (a list of statement lines)."""
        rng = self.rng
        body = []
        chosen = [o for o in outs if rng.random() < 0.5] or [rng.choice(outs)]
        for n, w in chosen:
            r = rng.random()
            if w == 1:
                if r < 0.7:
                    body.append(f"{n} = 1'b1;")
                elif r < 0.85:
                    body.append(f"{n} = fn[{rng.randrange(w_fn)}];")
                else:
                    body.append(f"{n} = fn == {self.const(w_fn, rng.randrange(1 << w_fn))};")
                continue
            if r < 0.45:
                body.append(f"{n} = {self.const(w, rng.randrange(1 << w))};")
            elif r < 0.6:
                pad = w - w_fn
                src = f"fn[{w - 1}:0]" if pad < 0 else ("fn" if pad == 0 else f"{{{pad}'b0, fn}}")
                body.append(f"{n} = {src};")
            elif r < 0.75:
                body.append(f"{n} = (fn == {self.const(w_fn, rng.randrange(1 << w_fn))}) ? "
                            f"{self.const(w, rng.randrange(1 << w))} : {self.const(w, rng.randrange(1 << w))};")
            elif r < 0.9:
                self.used.add("nested")
                vals = rng.sample(range(1 << w_fn), min(1 << w_fn, rng.randint(2, 3)))
                body.append("case (fn)")
                for v in vals:
                    body.append(f"  {self.const(w_fn, v)}: {n} = {self.const(w, rng.randrange(1 << w))};")
                body.append(f"  default: {n} = {self.const(w, rng.randrange(1 << w))};")
                body.append("endcase")
            elif has_mode:
                body.append(f"if (mode[{rng.randrange(2)}]) {n} = {self.const(w, rng.randrange(1 << w))};")
                body.append(f"else {n} = {self.const(w, rng.randrange(1 << w))};")
            else:
                body.append(f"{n} = {self.const(w, rng.randrange(1 << w))};")
        if struct and rng.random() < 0.6:
            body.append("ctl.go = 1'b1;")
            body.append(f"ctl.unit = 2'd{rng.randrange(4)};")
            if struct["enum"]:
                body.append(f"ctl.kind = {rng.choice(struct['kinds'][1:])};")
            elif rng.random() < 0.5:
                body.append("ctl.sub = fn[0];")
        return body


def generate(seed, index, features=None):
    """(module text, description) of decoder `index` of campaign `seed` (features unused)."""
    return DecoderGen(seed, index).generate()


def main():
    p = argparse.ArgumentParser(description="print one random decoder")
    p.add_argument("--seed", type=int, default=1)
    p.add_argument("--index", type=int, default=0)
    a = p.parse_args()
    text, _ = generate(a.seed, a.index)
    print(text)


if __name__ == "__main__":
    main()
