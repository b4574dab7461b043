/**
 * Temperature-dependent thermal conductivity, integrated exactly (Kirchhoff transform).
 * For a layer between T_in and T_out the heat flow is S·∫k dT, with the shape factor
 * S = 2π/ln(r₂/r₁) per metre of cylinder or 1/thickness per m² of flat wall (ASTM C680, ISO 12241).
 * Temperatures are °C throughout, as conductivity data are quoted against mean temperature in °C.
 */

export type ConductivitySpec =
  | { type: 'constant'; k: number }
  | { type: 'linear'; a: number; b: number } // k = a + b·T
  | { type: 'table'; points: [number, number][] } // piecewise linear, constant beyond the ends
  | { type: 'polynomial'; coefficients: number[] }; // k = Σ cᵢ·Tⁱ

export interface Conductivity {
  /** k at T, W/(m·K). */
  k(T: number): number;
  /** ∫ k dT from T1 to T2, W/m. */
  integral(T1: number, T2: number): number;
  /** T_out such that ∫ from T_out to T_in of k dT = target (W/m); NaN when no such T exists. */
  solveOut(Tin: number, target: number): number;
}

/** Root of (b/2)x² + a·x = c with the branch continuous at b = 0. */
function quadraticRoot(a: number, b: number, c: number): number {
  if (b === 0) return c / a;
  const disc = a * a + 2 * b * c;
  if (disc < 0) return NaN;
  const s = Math.sqrt(disc);
  return a >= 0 ? (2 * c) / (a + s) : (-a - s) / b;
}

function linear(a: number, b: number): Conductivity {
  const F = (T: number) => a * T + 0.5 * b * T * T;
  return {
    k: (T) => a + b * T,
    integral: (T1, T2) => F(T2) - F(T1),
    solveOut(Tin, target) {
      // F(Tout) = F(Tin) − target, solved as a quadratic in Tout.
      const x = quadraticRoot(a, b, F(Tin) - target);
      return a + b * x > 0 ? x : NaN;
    },
  };
}

function table(points: [number, number][]): Conductivity {
  const pts = [...points].sort((p, q) => p[0] - q[0]);
  const n = pts.length;
  if (n === 1) return linear(pts[0][1], 0);
  // Typed arrays and the segment slopes computed once: these run in the solver's inner loop.
  const T = Float64Array.from(pts, (p) => p[0]);
  const K = Float64Array.from(pts, (p) => p[1]);
  const S = new Float64Array(n); // slope of segment i (T[i] → T[i+1])
  for (let i = 0; i < n - 1; i++) S[i] = (K[i + 1] - K[i]) / (T[i + 1] - T[i]);
  // Antiderivative at the knots, F(T[0]) = 0.
  const F = new Float64Array(n);
  for (let i = 1; i < n; i++) F[i] = F[i - 1] + 0.5 * (K[i] + K[i - 1]) * (T[i] - T[i - 1]);
  const last = n - 1;
  const kAt = (t: number) => {
    if (t <= T[0]) return K[0];
    if (t >= T[last]) return K[last];
    let i = 0;
    while (t > T[i + 1]) i++;
    return K[i] + S[i] * (t - T[i]);
  };
  const Fat = (t: number) => {
    if (t <= T[0]) return K[0] * (t - T[0]);
    if (t >= T[last]) return F[last] + K[last] * (t - T[last]);
    let i = 0;
    while (t > T[i + 1]) i++;
    const d = t - T[i];
    return F[i] + K[i] * d + 0.5 * S[i] * d * d;
  };
  return {
    k: kAt,
    integral: (T1, T2) => Fat(T2) - Fat(T1),
    solveOut(Tin, target) {
      const f = Fat(Tin) - target;
      if (f <= 0) return T[0] + f / K[0];
      if (f >= F[last]) return T[last] + (f - F[last]) / K[last];
      let i = 0;
      while (f > F[i + 1]) i++;
      return T[i] + quadraticRoot(K[i], S[i], f - F[i]);
    },
  };
}

function polynomial(c: number[]): Conductivity {
  const kAt = (T: number) => {
    let s = 0;
    for (let i = c.length - 1; i >= 0; i--) s = s * T + c[i];
    return s;
  };
  const Fat = (T: number) => {
    let s = 0;
    for (let i = c.length - 1; i >= 0; i--) s = s * T + c[i] / (i + 1);
    return s * T;
  };
  return {
    k: kAt,
    integral: (T1, T2) => Fat(T2) - Fat(T1),
    solveOut(Tin, target) {
      // Newton from the constant-k estimate; F is increasing while k > 0.
      const goal = Fat(Tin) - target;
      let x = Tin - target / kAt(Tin);
      for (let it = 0; it < 50; it++) {
        const kx = kAt(x);
        if (!(kx > 0)) return NaN;
        const dx = (Fat(x) - goal) / kx;
        x -= dx;
        if (Math.abs(dx) < 1e-10 * (1 + Math.abs(x))) return x;
      }
      return NaN;
    },
  };
}

export function compileConductivity(spec: ConductivitySpec): Conductivity {
  switch (spec.type) {
    case 'constant':
      return linear(spec.k, 0);
    case 'linear':
      return linear(spec.a, spec.b);
    case 'table':
      return table(spec.points);
    case 'polynomial':
      return polynomial(spec.coefficients);
  }
}

/** Mean conductivity over [T1, T2] — what a "k at mean temperature" figure approximates. */
export function meanConductivity(c: Conductivity, T1: number, T2: number): number {
  return T1 === T2 ? c.k(T1) : c.integral(T1, T2) / (T2 - T1);
}
