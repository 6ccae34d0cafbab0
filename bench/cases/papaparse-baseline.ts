/** Baseline: papaparse alone streaming both files (Node stream input, rows counted, nothing kept). */
import fs from "node:fs";
import Papa from "papaparse";
import type { BenchCase } from "../bench-case";

function parseFile(file: string): Promise<number> {
  return new Promise((resolve, reject) => {
    let rows = 0;
    Papa.parse(fs.createReadStream(file, { encoding: "utf8" }) as unknown as File, {
      chunk: (results: Papa.ParseResult<string[]>) => {
        rows += results.data.length;
      },
      complete: () => resolve(rows),
      error: (err: Error) => reject(err),
    });
  });
}

const benchCase: BenchCase = {
  name: "papaparse-baseline",
  async run({ baseFile, roverFile }) {
    const rows = (await parseFile(baseFile)) + (await parseFile(roverFile));
    return { rows };
  },
};
export default benchCase;
