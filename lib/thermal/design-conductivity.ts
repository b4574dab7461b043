/**
 * Design thermal conductivity (EN ISO 23993:2008, "Thermal insulation products for building
 * equipment and industrial installations — Determination of design thermal conductivity"). The
 * declared curve (λ against mean temperature, tested to EN ISO 8497 / ASTM C335 and declared by
 * the manufacturer, e.g. under EN ISO 13787) is kept as it is; the design curve the thickness is
 * chosen on is the declared one times the conversion factors of ISO 23993 §5 for the conditions in
 * service:
 *   λ_design(T) = λ_declared(T) · F_a · F_m · F_i
 * with F_a ageing (cell-gas diffusion of foams, settling), F_m moisture (ISO 10456 form
 * e^{f_u·Δu}, given here as the resulting factor) and F_i installation (joints, multiple layers,
 * spacers and supports — the installation allowance ISO 23993 adds for the system as built). The
 * temperature dependence is the declared curve's own (piecewise linear in mean temperature
 * between declared points, as ISO 23993 interpolates declared values; constant beyond the ends).
 *
 * ISO 23993 gives the method, not universal factor values: each factor is the product's or the
 * project's, with its source. None is assumed here (1.00 until the project sets it).
 */
import type { ConductivitySpec } from './conductivity';

export interface DesignFactors {
  /** Ageing conversion factor, ≥ 1. */
  ageing: number;
  /** Moisture conversion factor, ≥ 1. */
  moisture: number;
  /** Installation factor (joints, layers, supports), ≥ 1. */
  installation: number;
  /** Where the factors come from (data sheet, test report, specification clause). */
  source?: string;
}

/** The product of the conversion factors (1 when none is given). */
export function designFactor(f: DesignFactors | undefined): number {
  return f ? f.ageing * f.moisture * f.installation : 1;
}

/** The design curve: the declared curve scaled by the product of the factors (the same object when it is 1). */
export function designConductivitySpec(m: {
  conductivity: ConductivitySpec;
  designFactors?: DesignFactors;
}): ConductivitySpec {
  const F = designFactor(m.designFactors);
  if (F === 1) return m.conductivity;
  const c = m.conductivity;
  switch (c.type) {
    case 'constant':
      return { type: 'constant', k: c.k * F };
    case 'linear':
      return { type: 'linear', a: c.a * F, b: c.b * F };
    case 'table':
      return { type: 'table', points: c.points.map(([t, k]) => [t, k * F] as [number, number]) };
    case 'polynomial':
      return { type: 'polynomial', coefficients: c.coefficients.map((x) => x * F) };
  }
}
