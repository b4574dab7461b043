/**
 * Water and steam by IAPWS-IF97 (IAPWS R7-97(2012), "Revised Release on the IAPWS Industrial
 * Formulation 1997 for the Thermodynamic Properties of Water and Steam"):
 * region 4 (saturation line, eqs. 30–31), region 1 (liquid, eq. 7, Table 2) and region 2 (vapour,
 * eqs. 15–17, Tables 10–11). Units inside: K, MPa, kJ/kg. Coefficients are the release's tables.
 */

const R = 0.461526; // kJ/(kg·K)

// Region 4, Table 34.
const N4 = [
  0.11670521452767e4, -0.72421316703206e6, -0.17073846940092e2, 0.1202082470247e5, -0.32325550322333e7,
  0.1491510861353e2, -0.48232657361591e4, 0.40511340542057e6, -0.23855557567849, 0.65017534844798e3,
];

/** Saturation pressure (MPa) at T (K); valid 273.15 K ≤ T ≤ 647.096 K. IF97 eq. (30). */
export function saturationPressureMPa(T: number): number {
  const th = T + N4[8] / (T - N4[9]);
  const A = th * th + N4[0] * th + N4[1];
  const B = N4[2] * th * th + N4[3] * th + N4[4];
  const C = N4[5] * th * th + N4[6] * th + N4[7];
  const x = (2 * C) / (-B + Math.sqrt(B * B - 4 * A * C));
  return x * x * x * x;
}

/** Saturation temperature (K) at p (MPa); valid 611.213 Pa ≤ p ≤ 22.064 MPa. IF97 eq. (31). */
export function saturationTemperatureK(p: number): number {
  const b = Math.pow(p, 0.25);
  const E = b * b + N4[2] * b + N4[5];
  const F = N4[0] * b * b + N4[3] * b + N4[6];
  const G = N4[1] * b * b + N4[4] * b + N4[7];
  const D = (2 * G) / (-F - Math.sqrt(F * F - 4 * E * G));
  return (N4[9] + D - Math.sqrt((N4[9] + D) * (N4[9] + D) - 4 * (N4[8] + N4[9] * D))) / 2;
}

// Region 1, Table 2: I, J, n.
const R1: [number, number, number][] = [
  [0, -2, 0.14632971213167],
  [0, -1, -0.84548187169114],
  [0, 0, -0.3756360367204e1],
  [0, 1, 0.33855169168385e1],
  [0, 2, -0.95791963387872],
  [0, 3, 0.15772038513228],
  [0, 4, -0.16616417199501e-1],
  [0, 5, 0.81214629983568e-3],
  [1, -9, 0.28319080123804e-3],
  [1, -7, -0.60706301565874e-3],
  [1, -1, -0.18990068218419e-1],
  [1, 0, -0.32529748770505e-1],
  [1, 1, -0.21841717175414e-1],
  [1, 3, -0.5283835796993e-4],
  [2, -3, -0.47184321073267e-3],
  [2, 0, -0.30001780793026e-3],
  [2, 1, 0.47661393906987e-4],
  [2, 3, -0.44141845330846e-5],
  [2, 17, -0.72694996297594e-15],
  [3, -4, -0.31679644845054e-4],
  [3, 0, -0.28270797985312e-5],
  [3, 6, -0.85205128120103e-9],
  [4, -5, -0.22425281908e-5],
  [4, -2, -0.65171222895601e-6],
  [4, 10, -0.14341729937924e-12],
  [5, -8, -0.40516996860117e-6],
  [8, -11, -0.12734301741641e-8],
  [8, -6, -0.17424871230634e-9],
  [21, -29, -0.68762131295531e-18],
  [23, -31, 0.14478307828521e-19],
  [29, -38, 0.26335781662795e-22],
  [30, -39, -0.11947622640071e-22],
  [31, -40, 0.18228094581404e-23],
  [32, -41, -0.93537087292458e-25],
];

export interface StateProperties {
  /** Specific volume, m³/kg. */ v: number;
  /** Specific enthalpy, kJ/kg. */ h: number;
  /** Specific internal energy, kJ/kg. */ u: number;
  /** Specific entropy, kJ/(kg·K). */ s: number;
  /** Isobaric heat capacity, kJ/(kg·K). */ cp: number;
  /** Speed of sound, m/s. */ w: number;
}

/** Region 1 (compressed liquid) properties at T (K), p (MPa). IF97 eq. (7) and Table 3. */
export function region1(T: number, p: number): StateProperties {
  const pi = p / 16.53,
    tau = 1386 / T;
  let g = 0,
    gp = 0,
    gpp = 0,
    gt = 0,
    gtt = 0,
    gpt = 0;
  for (const [I, J, n] of R1) {
    const a = 7.1 - pi,
      b = tau - 1.222;
    const aI = Math.pow(a, I),
      bJ = Math.pow(b, J);
    g += n * aI * bJ;
    gp += -n * I * Math.pow(a, I - 1) * bJ;
    gpp += n * I * (I - 1) * Math.pow(a, I - 2) * bJ;
    gt += n * aI * J * Math.pow(b, J - 1);
    gtt += n * aI * J * (J - 1) * Math.pow(b, J - 2);
    gpt += -n * I * Math.pow(a, I - 1) * J * Math.pow(b, J - 1);
  }
  void g;
  const RT = R * T;
  const v = (pi * gp * RT) / (p * 1000);
  const h = tau * gt * RT;
  const u = RT * (tau * gt - pi * gp);
  const s = R * (tau * gt - g);
  const cp = -R * tau * tau * gtt;
  const w = Math.sqrt((1000 * R * T * (gp * gp)) / ((gp - tau * gpt) ** 2 / (tau * tau * gtt) - gpp));
  return { v, h, u, s, cp, w };
}

// Region 2, Table 10 (ideal-gas part) and Table 11 (residual part).
const J0 = [0, 1, -5, -4, -3, -2, -1, 2, 3];
const N0 = [
  -0.96927686500217e1, 0.10086655968018e2, -0.5608791128302e-2, 0.71452738081455e-1, -0.40710498223928,
  0.14240819171444e1, -0.4383951131945e1, -0.28408632460772, 0.21268463753307e-1,
];
const R2: [number, number, number][] = [
  [1, 0, -0.17731742473213e-2],
  [1, 1, -0.17834862292358e-1],
  [1, 2, -0.45996013696365e-1],
  [1, 3, -0.57581259083432e-1],
  [1, 6, -0.5032527872793e-1],
  [2, 1, -0.33032641670203e-4],
  [2, 2, -0.18948987516315e-3],
  [2, 4, -0.39392777243355e-2],
  [2, 7, -0.43797295650573e-1],
  [2, 36, -0.26674547914087e-4],
  [3, 0, 0.20481737692309e-7],
  [3, 1, 0.43870667284435e-6],
  [3, 3, -0.3227767723857e-4],
  [3, 6, -0.15033924542148e-2],
  [3, 35, -0.40668253562649e-1],
  [4, 1, -0.78847309559367e-9],
  [4, 2, 0.12790717852285e-7],
  [4, 3, 0.48225372718507e-6],
  [5, 7, 0.22922076337661e-5],
  [6, 3, -0.16714766451061e-10],
  [6, 16, -0.21171472321355e-2],
  [6, 35, -0.23895741934104e2],
  [7, 0, -0.5905956432427e-17],
  [7, 11, -0.12621808899101e-5],
  [7, 25, -0.38946842435739e-1],
  [8, 8, 0.11256211360459e-10],
  [8, 36, -0.82311340897998e1],
  [9, 13, 0.19809712802088e-7],
  [10, 4, 0.10406965210174e-18],
  [10, 10, -0.10234747095929e-12],
  [10, 14, -0.10018179379511e-8],
  [16, 29, -0.80882908646985e-10],
  [16, 50, 0.10693031879409],
  [18, 57, -0.33662250574171],
  [20, 20, 0.89185845355421e-24],
  [20, 35, 0.30629316876232e-12],
  [20, 48, -0.42002467698208e-5],
  [21, 21, -0.59056029685639e-25],
  [22, 53, 0.37826947613457e-5],
  [23, 39, -0.12768608934681e-14],
  [24, 26, 0.73087610595061e-28],
  [24, 40, 0.55414715350778e-16],
  [24, 58, -0.9436970724121e-6],
];

/** Region 2 (vapour) properties at T (K), p (MPa). IF97 eqs. (15)–(17) and Table 12. */
export function region2(T: number, p: number): StateProperties {
  const pi = p,
    tau = 540 / T;
  let g0 = Math.log(pi),
    g0t = 0,
    g0tt = 0;
  for (let i = 0; i < 9; i++) {
    g0 += N0[i] * Math.pow(tau, J0[i]);
    g0t += N0[i] * J0[i] * Math.pow(tau, J0[i] - 1);
    g0tt += N0[i] * J0[i] * (J0[i] - 1) * Math.pow(tau, J0[i] - 2);
  }
  const g0p = 1 / pi,
    g0pp = -1 / (pi * pi);
  let gr = 0,
    grp = 0,
    grpp = 0,
    grt = 0,
    grtt = 0,
    grpt = 0;
  const b = tau - 0.5;
  for (const [I, J, n] of R2) {
    const pI = Math.pow(pi, I),
      bJ = Math.pow(b, J);
    gr += n * pI * bJ;
    grp += n * I * Math.pow(pi, I - 1) * bJ;
    grpp += n * I * (I - 1) * Math.pow(pi, I - 2) * bJ;
    grt += n * pI * J * Math.pow(b, J - 1);
    grtt += n * pI * J * (J - 1) * Math.pow(b, J - 2);
    grpt += n * I * Math.pow(pi, I - 1) * J * Math.pow(b, J - 1);
  }
  const RT = R * T;
  const v = (pi * (g0p + grp) * RT) / (p * 1000);
  const h = tau * (g0t + grt) * RT;
  const u = RT * (tau * (g0t + grt) - pi * (g0p + grp));
  const s = R * (tau * (g0t + grt) - (g0 + gr));
  const cp = -R * tau * tau * (g0tt + grtt);
  const num = 1 + 2 * pi * grp + pi * pi * grp * grp;
  const den = 1 - pi * pi * grpp + (1 + pi * grp - tau * pi * grpt) ** 2 / (tau * tau * (g0tt + grtt));
  const w = Math.sqrt((1000 * R * T * num) / den);
  void g0pp;
  return { v, h, u, s, cp, w };
}

export interface SaturatedSteam {
  pressureMPa: number;
  temperatureC: number;
  hLiquidKJPerKg: number;
  hVapourKJPerKg: number;
  latentHeatKJPerKg: number;
}

/**
 * Saturated steam at an absolute pressure: temperature (region 4), liquid and vapour enthalpies
 * (regions 1 and 2 on the saturation line) and the latent heat h_fg = h'' − h'.
 * Valid 0.000611 to 16.529 MPa (regions 1/2 meet the saturation line up to 623.15 K).
 */
export function saturatedSteamAtPressure(pressureMPa: number): SaturatedSteam {
  if (!(pressureMPa >= 611.213e-6 && pressureMPa <= 16.5292))
    throw new RangeError('Steam pressure must be between 0.000611 and 16.53 MPa (absolute) for this method');
  const T = saturationTemperatureK(pressureMPa);
  const hf = region1(T, pressureMPa).h,
    hg = region2(T, pressureMPa).h;
  return {
    pressureMPa,
    temperatureC: T - 273.15,
    hLiquidKJPerKg: hf,
    hVapourKJPerKg: hg,
    latentHeatKJPerKg: hg - hf,
  };
}

/** Condensate formed by a steam line's heat loss, kg/h: Q (W) ÷ h_fg (J/kg) × 3600. */
export function condensateKgPerHour(heatLossW: number, latentHeatKJPerKg: number): number {
  return (heatLossW / (latentHeatKJPerKg * 1000)) * 3600;
}
