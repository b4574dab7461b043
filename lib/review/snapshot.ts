import type { Disposition } from './dispositions';
import type { Flag } from './flags';

/** A signed-off round's record, kept as signed (`review_rounds.snapshot`). */
export interface ReviewSnapshot {
  signedBy: string;
  calcVersion: string;
  basisRevision: number;
  items: {
    tag: string;
    area: string;
    flags: Flag[];
    disposition: Disposition | null;
    comment: string | null;
    requiredMm: number | null;
    decidedBy: string | null;
    /** A Date when written; its ISO text when read back. */
    decidedAt: Date | string | null;
  }[];
}
