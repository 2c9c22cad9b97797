// kerf-case: Tag lookup of a small fully associative table in an invented DMA descriptor cache:
// kerf-case: a packed array of packed structs as input, per-entry match by a generate loop with a
// kerf-case: named block, the first hit found by a for loop with a found flag (the style of
// kerf-case: hand-written CAMs), a hit count by a loop sum, and a match vector read by index.
module tag_match_cam (
  input  logic [5:0] lookup_tag,
  input  logic       lookup_wr,
  input  logic [3:0][7:0] entries,   // {valid, writable, tag[5:0]} per entry
  output logic [3:0] hit_vec,
  output logic       hit,
  output logic [1:0] hit_idx,
  output logic       wr_fault,
  output logic [2:0] hit_count
);
  typedef struct packed {
    logic       valid;
    logic       writable;
    logic [5:0] tag;
  } entry_t;

  for (genvar i = 0; i < 4; i++) begin : g_match
    entry_t e;
    assign e          = entries[i];   // packed: assignment compatible
    assign hit_vec[i] = e.valid && (e.tag == lookup_tag);
  end

  always_comb begin
    logic found;
    found   = 1'b0;
    hit_idx = '0;
    for (int i = 0; i < 4; i++) begin
      if (!found && hit_vec[i]) begin
        found   = 1'b1;
        hit_idx = 2'(i);
      end
    end
    hit = found;
  end

  always_comb begin
    hit_count = '0;
    for (int i = 0; i < 4; i++) hit_count = hit_count + 3'(hit_vec[i]);
  end

  // A write that hits a read-only entry faults; the entry is the first hit.
  logic [7:0] hit_entry;
  assign hit_entry = entries[hit_idx];
  assign wr_fault  = lookup_wr && hit && !hit_entry[6];
endmodule
