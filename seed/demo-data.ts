/**
 * The demo scenario — invented for Lagwise: Korvane Polymers' Brack Point site, where a steam
 * network upgrade is being insulated; Hollis Thermal Services is the insulation contractor.
 * Tallgate Energy is a second, unrelated organization (used to show that data stays apart).
 */
export const DEMO_ORG = { name: 'Korvane Polymers' };
export const DEMO_PROJECT = {
  code: 'BP-STM-24',
  name: 'Brack Point steam network upgrade',
  site: 'Brack Point polymer works, units 20–40',
};

export const DEMO_USERS = [
  {
    key: 'owner',
    role: 'owner',
    name: 'Olwen Ayres',
    email: 'owner@korvane.example',
    password: 'kiln-owner-4471',
  },
  {
    key: 'engineer',
    role: 'engineer',
    name: 'Dario Fenn',
    email: 'engineer@korvane.example',
    password: 'kiln-engineer-4471',
  },
  {
    key: 'reviewer',
    role: 'reviewer',
    name: 'Mira Castell',
    email: 'reviewer@korvane.example',
    password: 'kiln-reviewer-4471',
  },
  {
    key: 'contractor',
    role: 'contractor',
    name: 'Tomas Hollis',
    email: 'contractor@hollis-thermal.example',
    password: 'kiln-contractor-4471',
  },
] as const;

export const OTHER_ORG = {
  name: 'Tallgate Energy',
  project: { code: 'TG-HRSG-2', name: 'Tallgate HRSG 2 piping', site: 'Tallgate power station' },
  user: { name: 'Quentin Roe', email: 'owner@tallgate.example', password: 'kiln-tallgate-4471' },
};
