// Constants repeated here (not imported) because this is the innermost loop of every solve.
const R_AIR = 287.05287,
  STANDARD_PRESSURE = 101325;

/**
 * Dry air at 101.325 kPa, properties at a film temperature.
 * - Dynamic viscosity: Sutherland's law in the U.S. Standard Atmosphere 1976 form,
 *   μ = β·T^1.5 / (T + S), β = 1.458e-6 kg/(m·s·K^½), S = 110.4 K.
 * - Thermal conductivity: U.S. Standard Atmosphere 1976, eq. (53):
 *   k = 2.64638e-3·T^1.5 / (T + 245.4·10^(−12/T)) W/(m·K).
 * - Density: ideal gas, ρ = p / (R·T).
 * - Specific heat: table of dry air at 1 atm (Incropera et al., Fundamentals of Heat and Mass
 *   Transfer, Table A.4 — values recalled from memory), linear interpolation.
 * Valid: about 200 K to 1000 K (the standard-atmosphere formulas are fitted over the lower part;
 * above ~400 K they remain within a few per cent of tabulated data).
 */
export interface AirProperties {
  /** Thermal conductivity, W/(m·K). */ k: number;
  /** Kinematic viscosity, m²/s. */ nu: number;
  /** Prandtl number. */ pr: number;
  /** Volumetric expansion coefficient, 1/K (ideal gas: 1/T). */ beta: number;
}

// Dry air cp, J/(kg·K), at 200…1000 K every 50 K (Incropera Table A.4, recalled from memory).
const CP_T0 = 200,
  CP_DT = 50;
const CP = [
  1007, 1006, 1007, 1009, 1014, 1021, 1030, 1040, 1051, 1063, 1075, 1087, 1099, 1110, 1121, 1131, 1141,
];

function cpAir(T: number): number {
  const x = (T - CP_T0) / CP_DT;
  if (x <= 0) return CP[0];
  if (x >= CP.length - 1) return CP[CP.length - 1];
  const i = Math.floor(x);
  return CP[i] + (CP[i + 1] - CP[i]) * (x - i);
}

/** Air properties at temperature T in kelvin. */
export function airPropertiesAt(T: number, pressurePa = STANDARD_PRESSURE): AirProperties {
  const t15 = T * Math.sqrt(T);
  const mu = (1.458e-6 * t15) / (T + 110.4);
  const k = (2.64638e-3 * t15) / (T + 245.4 * Math.exp(-27.631021115928547 / T)); // 10^(−12/T)
  const rho = pressurePa / (R_AIR * T);
  const cp = cpAir(T);
  return { k, nu: mu / rho, pr: (mu * cp) / k, beta: 1 / T };
}

/** Air at a film temperature as the solver's inner loop reads it (with the correlations' Prandtl factors). */
export interface FilmProperties {
  k: number;
  nu: number;
  pr: number;
  fCyl: number;
  fPlate: number;
  fCb: number;
  beta: number;
}

/**
 * Film properties for the solver's inner loop: the formulas above evaluated once on a 0.5 K grid
 * from 150 K to 1300 K (with the Prandtl factors of the correlations) and interpolated linearly —
 * within 2e-6 of the formulas (tested; largest at the kinks of the cp table), at a fraction of their
 * cost. The grid is built at load and never changed; `filmAt` writes into the object it is given.
 */
const G0 = 150,
  GDT = 0.5,
  GN = Math.round((1300 - G0) / GDT) + 1;
function exactFilm(T: number, out: FilmProperties) {
  const a = airPropertiesAt(T);
  out.k = a.k;
  out.nu = a.nu;
  out.pr = a.pr;
  out.fCyl = Math.pow(1 + Math.pow(0.559 / a.pr, 9 / 16), 8 / 27);
  out.fPlate = Math.pow(1 + Math.pow(0.492 / a.pr, 9 / 16), 8 / 27);
  out.fCb = Math.cbrt(a.pr) / Math.sqrt(Math.sqrt(1 + Math.pow(0.4 / a.pr, 2 / 3)));
}
function buildGrid() {
  const g = {
    k: new Float64Array(GN),
    nu: new Float64Array(GN),
    pr: new Float64Array(GN),
    cyl: new Float64Array(GN),
    plate: new Float64Array(GN),
    cb: new Float64Array(GN),
  };
  const f: FilmProperties = { k: 0, nu: 0, pr: 0, fCyl: 0, fPlate: 0, fCb: 0, beta: 0 };
  for (let i = 0; i < GN; i++) {
    exactFilm(G0 + i * GDT, f);
    g.k[i] = f.k;
    g.nu[i] = f.nu;
    g.pr[i] = f.pr;
    g.cyl[i] = f.fCyl;
    g.plate[i] = f.fPlate;
    g.cb[i] = f.fCb;
  }
  return g;
}
const GRID = buildGrid();
const GK = GRID.k,
  GNU = GRID.nu,
  GPR = GRID.pr,
  GCYL = GRID.cyl,
  GPLATE = GRID.plate,
  GCB = GRID.cb;

const newFilm = (): FilmProperties => ({ k: 0, nu: 0, pr: 0, fCyl: 0, fPlate: 0, fCb: 0, beta: 0 });

/**
 * Film properties at T (K), written into `out` (a workspace's `film`; a new object when not given)
 * and returned; outside the grid the formulas are evaluated directly.
 */
export function filmAt(T: number, out: FilmProperties = newFilm()): FilmProperties {
  out.beta = 1 / T;
  const x = (T - G0) / GDT;
  if (!(x >= 0 && x < GN - 1)) {
    exactFilm(T, out);
    return out;
  }
  const i = x | 0,
    f = x - i;
  out.k = GK[i] + (GK[i + 1] - GK[i]) * f;
  out.nu = GNU[i] + (GNU[i + 1] - GNU[i]) * f;
  out.pr = GPR[i] + (GPR[i + 1] - GPR[i]) * f;
  out.fCyl = GCYL[i] + (GCYL[i + 1] - GCYL[i]) * f;
  out.fPlate = GPLATE[i] + (GPLATE[i + 1] - GPLATE[i]) * f;
  out.fCb = GCB[i] + (GCB[i + 1] - GCB[i]) * f;
  return out;
}
