/** Unit conversions between SI (used inside the engine) and US customary (input and display). */

export const cToF = (c: number) => c * 1.8 + 32;
export const fToC = (f: number) => (f - 32) / 1.8;
export const deltaKToF = (k: number) => k * 1.8;
export const mmToIn = (mm: number) => mm / 25.4;
export const inToMm = (inch: number) => inch * 25.4;
export const mToFt = (m: number) => m / 0.3048;
export const ftToM = (ft: number) => ft * 0.3048;

/** 1 Btu (IT) = 1055.05585262 J; 1 h = 3600 s; 1 ft = 0.3048 m; 1 °F-difference = 5/9 K. */
const BTU = 1055.05585262;
/** W/m → Btu/(h·ft). */
export const wPerMToBtuPerHFt = (w: number) => (w * 3600 * 0.3048) / BTU;
export const btuPerHFtToWPerM = (b: number) => (b * BTU) / (3600 * 0.3048);
/** W/m² → Btu/(h·ft²). */
export const wPerM2ToBtuPerHFt2 = (w: number) => (w * 3600 * 0.3048 * 0.3048) / BTU;
export const btuPerHFt2ToWPerM2 = (b: number) => (b * BTU) / (3600 * 0.3048 * 0.3048);
/** Thermal conductivity: W/(m·K) ↔ Btu·in/(h·ft²·°F); 1 Btu·in/(h·ft²·°F) = 0.144228 W/(m·K). */
const K_FACTOR = (((BTU / 3600) * 0.0254) / (0.3048 * 0.3048)) * 1.8;
export const wPerMKToBtuInPerHFt2F = (k: number) => k / K_FACTOR;
export const btuInPerHFt2FToWPerMK = (k: number) => k * K_FACTOR;
/** Heat transfer coefficient: W/(m²·K) ↔ Btu/(h·ft²·°F). */
export const wPerM2KToBtuPerHFt2F = (h: number) => wPerM2ToBtuPerHFt2(h) / 1.8;
/** Pressure: bar(g) ↔ MPa absolute, psig ↔ MPa absolute (standard atmosphere 0.101325 MPa). */
export const barGaugeToMPaAbs = (barg: number) => barg / 10 + 0.101325;
export const psigToMPaAbs = (psig: number) => (psig * 6894.757293168) / 1e6 + 0.101325;

export type UnitSystem = 'SI' | 'US';
