import { messyCorpus } from '/work/h-import/tests/fixtures/messy-lines';
import { parseUpload, viewSheet, describeCsv } from '/work/h-import/lib/lines/parse';
import { suggestMapping } from '/work/h-import/lib/lines/mapping';
import { validateSheet } from '/work/h-import/lib/lines/validate';
(async () => { for (const f of await messyCorpus()) {
  const p = await parseUpload(f.name, f.bytes);
  console.log('==', f.name, describeCsv(p));
  for (const st of p.sheets) {
    const s = viewSheet(st);
    const m = suggestMapping(s.headers);
    const v = validateSheet(s, m);
    console.log(' sheet', s.name, 'header', s.headerRows, JSON.stringify(s.headers), JSON.stringify(m), 'lines', v.lines.length);
    for (const i of v.issues) console.log('   ', i.row, i.column, i.severity, i.message);
    for (const l of v.lines) console.log('   L', l.tag, l.geometry, l.nps, l.outsideDiameterMm, l.lengthM?.toFixed(3), l.surfaceAreaM2, l.heightM, l.normalTempC.toFixed(2), l.maxTempC, l.purposes.join('+'), l.outdoor, l.accessible);
  }
} })();
