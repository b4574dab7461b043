/**
 * Largest request body each route accepts, checked from Content-Length in proxy.ts before any
 * code reads the body (413 instead of a failure deep inside). Line-list uploads are the only
 * large bodies: 20 MB of file plus form overhead, the same as Next's server-action limit
 * (next.config.ts `bodySizeLimit: '21mb'`).
 */
export const MB = 1024 * 1024;
export const UPLOAD_BODY_LIMIT = 21 * MB;
export const DEFAULT_BODY_LIMIT = 2 * MB;

const UPLOAD_PATH = /^\/projects\/[^/]+\/lines\/?$/;

export function bodyLimitFor(path: string, _method: string): number {
  return UPLOAD_PATH.test(path) ? UPLOAD_BODY_LIMIT : DEFAULT_BODY_LIMIT;
}

export const tooLargeMessage = (limit: number) =>
  `The request is too large: this page accepts at most ${Math.round(limit / MB)} MB. Nothing was saved.`;
