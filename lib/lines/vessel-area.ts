/**
 * The bare outside area of a vessel or tank from the dimensions an equipment list gives: shell
 * outside diameter, shell length (tangent to tangent) or height, and the head type. Pure geometry,
 * SI units (m, m²).
 */
export type HeadType = 'ellipsoidal' | 'hemispherical' | 'torispherical' | 'flat' | 'cone-roof';

export const HEAD_LABEL: Record<HeadType, string> = {
  ellipsoidal: '2:1 semi-ellipsoidal',
  hemispherical: 'Hemispherical',
  torispherical: 'Torispherical (ASME F&D)',
  flat: 'Flat',
  'cone-roof': 'Cone roof (tank)',
};

/**
 * Outside area of one 2:1 semi-ellipsoidal head of outside diameter D: half an oblate spheroid with
 * semi-axes a = D/2, b = D/4, A = π a² + (π b² / 2e) · ln((1 + e)/(1 − e)), e = √(1 − b²/a²)
 * (surface of an oblate spheroid, halved; the straight flange is counted in the shell length).
 * Check: D = 1 m → e = 0.8660, A = 0.7854 + 0.1134 · 2.634 = 1.0840 m² [X].
 */
export function ellipsoidalHeadAreaM2(diameterM: number): number {
  const a = diameterM / 2,
    b = diameterM / 4;
  const e = Math.sqrt(1 - (b * b) / (a * a));
  return Math.PI * a * a + ((Math.PI * b * b) / (2 * e)) * Math.log((1 + e) / (1 - e));
}

/** Hemispherical head: half a sphere, A = π D² / 2. Check: D = 1 m → 1.5708 m² [X]. */
export function hemisphericalHeadAreaM2(diameterM: number): number {
  return (Math.PI * diameterM * diameterM) / 2;
}

/**
 * Torispherical head: a spherical crown of radius R joined to a toroidal knuckle of radius r, here
 * with the ASME "flanged and dished" proportions R = D, r = 0.06 D (ASME BPVC Section VIII Div. 1,
 * UG-32 [recalled]). The crown meets the knuckle at the angle α from the axis, sin α = (D/2 − r)/(R − r);
 * crown cap A₁ = 2π R² (1 − cos α); knuckle (Pappus, the arc from α to π/2 about the axis at
 * distance c = D/2 − r) A₂ = 2π r [c (π/2 − α) + r cos α].
 * Check: D = 1 m → α = 0.4871 rad, A₁ = 0.7308, A₂ = 0.1997, A = 0.9306 m² [X].
 */
export function torisphericalHeadAreaM2(diameterM: number, crownRatio = 1, knuckleRatio = 0.06): number {
  const R = crownRatio * diameterM,
    r = knuckleRatio * diameterM,
    c = diameterM / 2 - r;
  const alpha = Math.asin(c / (R - r));
  const crown = 2 * Math.PI * R * R * (1 - Math.cos(alpha));
  const knuckle = 2 * Math.PI * r * (c * (Math.PI / 2 - alpha) + r * Math.cos(alpha));
  return crown + knuckle;
}

/** Flat end: A = π D² / 4. */
export function flatHeadAreaM2(diameterM: number): number {
  return (Math.PI * diameterM * diameterM) / 4;
}

/**
 * Cone roof of a storage tank at a slope of 1 in 16 — the least slope API 650 allows for a supported
 * cone roof [recalled], common practice for fixed-roof tanks: lateral area π (D/2) · s with the slant
 * s = (D/2) · √(1 + (1/16)²). Check: D = 10 m → 78.69 m² [X].
 */
export function coneRoofAreaM2(diameterM: number, slope = 1 / 16): number {
  const r = diameterM / 2;
  return Math.PI * r * r * Math.sqrt(1 + slope * slope);
}

/**
 * The vessel's bare outside area: shell π D L plus its ends — two heads of the given type, or for a
 * cone-roof tank the roof only (the bottom stands on its foundation and is not insulated).
 */
export function vesselAreaM2(diameterM: number, shellLengthM: number, head: HeadType): number {
  const shell = Math.PI * diameterM * shellLengthM;
  switch (head) {
    case 'ellipsoidal':
      return shell + 2 * ellipsoidalHeadAreaM2(diameterM);
    case 'hemispherical':
      return shell + 2 * hemisphericalHeadAreaM2(diameterM);
    case 'torispherical':
      return shell + 2 * torisphericalHeadAreaM2(diameterM);
    case 'flat':
      return shell + 2 * flatHeadAreaM2(diameterM);
    case 'cone-roof':
      return shell + coneRoofAreaM2(diameterM);
  }
}

/** Head words from equipment lists (English, German, French, Spanish, Dutch); null when not one of ours. */
export function parseHeadType(v: string): HeadType | null {
  const s = v
    .toLowerCase()
    .replace(/ß/g, 'ss')
    .normalize('NFD')
    .replace(/[\u0300-\u036f]/g, '')
    .replace(/[^a-z0-9]+/g, ' ')
    .trim();
  if (
    /^(2 1( se| semi ellipsoidal| ellipsoidal| elliptical| ell)?|(semi )?ellipsoidal|se|ell|elliptical|ellipsoid|elliptisch|korbbogen|elliptique|elipsoidal|elliptische?)( heads?)?$/.test(
      s,
    )
  )
    return 'ellipsoidal';
  if (
    /^(hemi|hemispherical|hemisphere|hs|halbkugel|hemispherique|semiesferico|halfbolvormig)( heads?)?$/.test(
      s,
    )
  )
    return 'hemispherical';
  if (
    /^(tori|torispherical|f ?& ?d|f d|fd|flanged (and|&) dished|klopper|klepper|torispherique|torisferico|torisferisch)( heads?)?$/.test(
      s,
    )
  )
    return 'torispherical';
  if (/^(flat|plain|flach|plat|plano|vlak|flat plate|flat heads?)( heads?)?$/.test(s)) return 'flat';
  if (/^(cone|cone roof|conical|conical roof|cr|kegeldach|toit conique|techo conico|kegeldak)$/.test(s))
    return 'cone-roof';
  return null;
}

/**
 * The engine's vessel: a vertical shell with two flat heads whose bare outside area is the given area,
 * πDH + 2·πD²/4 = A, so D = √(H² + 2A/π) − H (the positive root of the quadratic in D).
 */
export function vesselDiameterM(areaM2: number, heightM: number): number {
  return Math.sqrt(heightM * heightM + (2 * areaM2) / Math.PI) - heightM;
}
