/**
 * node --import tsx bench/make-line-list.ts <rows> <seed> <out.xlsx> — writes the generated line list
 * to a file. The benchmarks run it as a child process so that building a 50,000-row workbook in
 * memory does not count in the peak memory of the process that plays the web server.
 */
import { writeFileSync } from 'node:fs';
import { demoLineRows, lineListWorkbook } from '../seed/line-list';

const [rows, seed, out] = process.argv.slice(2);
lineListWorkbook(demoLineRows(Number(rows), Number(seed))).then((b) => writeFileSync(out, b));
