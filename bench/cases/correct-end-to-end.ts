/** `correct` end to end: read both files, correct (linear, median datum), subtract IGRF-14, write CSV. */
import fs from "node:fs";
import path from "node:path";
import { run } from "../../src/cli/commands/correct";
import type { BenchCase, BenchContext } from "../bench-case";

const outFile = (ctx: BenchContext) => path.join(ctx.outDir, "corrected.csv");

const benchCase: BenchCase = {
  name: "correct-igrf",
  prepare(ctx) {
    // A new output file, as a user writing a new file: on ext4, renaming a large file over an
    // existing one makes the kernel flush the new file's data first (auto_da_alloc), which times
    // the disk (0.1–2 s here), not this code.
    fs.rmSync(outFile(ctx), { force: true });
  },
  async run(ctx) {
    await run(["--base", ctx.baseFile, "--rover", ctx.roverFile, "--out", outFile(ctx), "--reference", "igrf"]);
  },
  async rows(ctx) {
    let lines = 0;
    for await (const buf of fs.createReadStream(outFile(ctx))) {
      for (let k = (buf as Buffer).indexOf(10); k >= 0; k = (buf as Buffer).indexOf(10, k + 1)) lines++;
    }
    return lines - 1; // header
  },
};
export default benchCase;
