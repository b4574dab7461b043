/** Display in the project's unit system (values are stored and computed in SI). Safe for client components. */
export type UnitSystem = 'SI' | 'US';

export interface Display {
  temp: (c: number | null | undefined) => string;
  thickness: (mm: number | null | undefined) => string;
  diameter: (mm: number | null | undefined) => string;
  length: (m: number | null | undefined) => string;
  linearLoss: (wPerM: number | null | undefined) => string;
  arealLoss: (wPerM2: number | null | undefined) => string;
  units: { temp: string; thickness: string; length: string; linearLoss: string; arealLoss: string };
}

const dash = (v: number | null | undefined) => v === null || v === undefined || !Number.isFinite(v);

export function display(system: UnitSystem): Display {
  if (system === 'US') {
    return {
      temp: (c) => (dash(c) ? '—' : `${((c as number) * 1.8 + 32).toFixed(0)}`),
      thickness: (mm) => (dash(mm) ? '—' : mm === 0 ? 'bare' : String(Number(((mm as number) / 25.4).toFixed(3)))), // ⅜ in stays 0.375
      diameter: (mm) => (dash(mm) ? '—' : `${((mm as number) / 25.4).toFixed(2)} in`),
      length: (m) => (dash(m) ? '—' : `${((m as number) / 0.3048).toFixed(0)}`),
      linearLoss: (w) => (dash(w) ? '—' : `${((w as number) * 1.04007).toFixed(1)}`),
      arealLoss: (w) => (dash(w) ? '—' : `${((w as number) * 0.316998).toFixed(1)}`),
      units: { temp: '°F', thickness: 'in', length: 'ft', linearLoss: 'Btu/h·ft', arealLoss: 'Btu/h·ft²' },
    };
  }
  return {
    temp: (c) => (dash(c) ? '—' : (c as number).toFixed(1)),
    thickness: (mm) => (dash(mm) ? '—' : mm === 0 ? 'bare' : String(mm)),
    diameter: (mm) => (dash(mm) ? '—' : `${(mm as number).toFixed(1)} mm`),
    length: (m) => (dash(m) ? '—' : (m as number).toFixed(1)),
    linearLoss: (w) => (dash(w) ? '—' : (w as number).toFixed(1)),
    arealLoss: (w) => (dash(w) ? '—' : (w as number).toFixed(1)),
    units: { temp: '°C', thickness: 'mm', length: 'm', linearLoss: 'W/m', arealLoss: 'W/m²' },
  };
}
