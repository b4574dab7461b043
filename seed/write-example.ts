/** Writes seed/brack-point-line-list.xlsx, the demo line list a new user can upload. */
import { writeFileSync } from 'node:fs';
import { demoLineRows, lineListWorkbook } from './line-list';

lineListWorkbook(demoLineRows(220), { withInstructions: true }).then((b) => {
  writeFileSync(new URL('./brack-point-line-list.xlsx', import.meta.url), b);
  console.error(`[seed] wrote brack-point-line-list.xlsx (${b.length} bytes)`);
});
