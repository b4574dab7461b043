/** Heat-tracing labels shared by pages, the bill workbook and the rule (lib/lines/tracing.ts); pure. */
import type { StoredTracing } from './stored-result';

/** The standard the duty follows, as a page or sheet names it. */
export const TRACING_STANDARD = 'IEEE 515 / IEC/IEEE 60079-30-2 sizing basis';

export const TRACING_REASON_LABEL: Record<StoredTracing['reason'], string> = {
  'line-list': 'marked traced in the line list',
  'freeze-protection': 'freeze protection (design basis)',
  'process-control': 'process temperature maintenance (design basis)',
};
