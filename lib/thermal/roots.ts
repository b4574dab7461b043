/**
 * Brent's method (R. P. Brent, Algorithms for Minimization without Derivatives, 1973, ch. 4):
 * inverse quadratic interpolation and secant steps, falling back to bisection, so it converges
 * whenever [a, b] brackets a sign change and can never leave the bracket.
 */
export function brentRoot(
  f: (x: number) => number,
  a: number,
  b: number,
  fa: number,
  fb: number,
  tol: number,
  maxIter = 100,
): { x: number; iterations: number } {
  if (fa === 0) return { x: a, iterations: 0 };
  if (fb === 0) return { x: b, iterations: 0 };
  let c = a,
    fc = fa,
    d = b - a,
    e = d;
  for (let it = 1; it <= maxIter; it++) {
    if ((fb > 0 && fc > 0) || (fb < 0 && fc < 0)) {
      c = a;
      fc = fa;
      d = e = b - a;
    }
    if (Math.abs(fc) < Math.abs(fb)) {
      a = b;
      b = c;
      c = a;
      fa = fb;
      fb = fc;
      fc = fa;
    }
    const tol1 = 2 * Number.EPSILON * Math.abs(b) + 0.5 * tol;
    const xm = 0.5 * (c - b);
    if (Math.abs(xm) <= tol1 || fb === 0) return { x: b, iterations: it };
    if (Math.abs(e) >= tol1 && Math.abs(fa) > Math.abs(fb)) {
      const s = fb / fa;
      let p: number, q: number;
      if (a === c) {
        p = 2 * xm * s;
        q = 1 - s;
      } else {
        const qq = fa / fc,
          r = fb / fc;
        p = s * (2 * xm * qq * (qq - r) - (b - a) * (r - 1));
        q = (qq - 1) * (r - 1) * (s - 1);
      }
      if (p > 0) q = -q;
      p = Math.abs(p);
      const min1 = 3 * xm * q - Math.abs(tol1 * q),
        min2 = Math.abs(e * q);
      if (2 * p < Math.min(min1, min2)) {
        e = d;
        d = p / q;
      } else {
        d = xm;
        e = d;
      }
    } else {
      d = xm;
      e = d;
    }
    a = b;
    fa = fb;
    b += Math.abs(d) > tol1 ? d : xm > 0 ? tol1 : -tol1;
    fb = f(b);
  }
  return { x: b, iterations: maxIter };
}
