/** The Lagwise heat-transfer engine: pure functions, SI units, no framework imports. */
export * from './air';
export * from './case';
export * from './conductivity';
export * from './constants';
export * from './correlations';
export * from './cui';
export * from './design-conductivity';
export * from './economics';
export * from './materials';
export * from './pipes';
export * from './psychro';
export * from './recommend';
export * from './rules';
export * from './energy-code';
export * from './fittings';
export * from './solve';
export * from './steam';
export * from './surface';
export * from './thickness';
export * from './touch';
export * from './tracing';
export * from './units';
/**
 * Stamped on every stored result; a result of another version is stale (lib/lines/stale.ts).
 * 2: vessels as shell + heads in the recommender; 3: one rule per safety criterion (rules.ts)
 * shared with the review; 4: touch limit by contact time and surface (ISO 13732-1), bare candidates
 * held to bare steel, design conductivity (EN ISO 23993), vessel parts, condition sets and emission
 * scopes on the results; 5: each candidate carries its vessel-part fluxes (picks and the bill per
 * vessel part).
 */
export const CALCULATION_VERSION = '2026.12-5';
export * from './defaults';
export * from './vessel';
export * from './workspace';
