import { expect, test } from './fixtures';
import { demo, signIn } from './helpers';

const good = {
  id: 'hw-2in',
  geometry: 'horizontal-pipe',
  pipeOuterDiameterMm: 60.3,
  processTempC: 100,
  ambientTempC: 20,
  windSpeedMs: 0,
  surfaceEmittance: 0.9,
  layers: [],
};

test('the calculation API answers a signed-in engineer and refuses bad requests clearly', async ({
  page,
  baseURL,
}) => {
  const u = demo('engineer');
  await signIn(page, u.email, u.password);
  const ok = await page.request.post('/api/v1/calc', { data: [good], headers: { origin: baseURL! } });
  expect(ok.status()).toBe(200);
  const [r] = await ok.json();
  // Bare 60.3 mm pipe at 100 °C in 20 °C still air, ε 0.9: about 230 W/m (Roymech table; ours within 5 %).
  expect(r.id).toBe('hw-2in');
  expect(Math.abs(r.heatLossWPerM - 230) / 230).toBeLessThan(0.05);

  const bad = await page.request.post('/api/v1/calc', {
    data: [
      good,
      {
        ...good,
        surfaceEmittance: 1.4,
        layers: [{ thicknessMm: -2, conductivity: { type: 'linear', a: 0.04, b: 0 } }],
      },
    ],
    headers: { origin: baseURL! },
  });
  expect(bad.status()).toBe(400);
  const body = await bad.json();
  expect(body.error.fields['1.surfaceEmittance'][0]).toBe('surfaceEmittance must be between 0 and 1');
  expect(body.error.fields['1.layers.0.thicknessMm'][0]).toBe('thicknessMm must be greater than 0');
  expect(body.error.fields['0.surfaceEmittance']).toBeUndefined();

  const crossSite = await page.request.post('/api/v1/calc', {
    data: [good],
    headers: { origin: 'https://elsewhere.example' },
  });
  expect(crossSite.status()).toBe(403);
  const notJson = await page.request.post('/api/v1/calc', {
    data: 'x=1',
    headers: { origin: baseURL!, 'content-type': 'text/plain' },
  });
  expect(notJson.status()).toBe(415);
});

test('the calculation API refuses a contractor and an anonymous caller', async ({
  page,
  baseURL,
  playwright,
}) => {
  const anon = await playwright.request.newContext({ baseURL });
  expect((await anon.post('/api/v1/calc', { data: [good], headers: { origin: baseURL! } })).status()).toBe(
    401,
  );
  await anon.dispose();
  const u = demo('contractor');
  await signIn(page, u.email, u.password);
  expect(
    (await page.request.post('/api/v1/calc', { data: [good], headers: { origin: baseURL! } })).status(),
  ).toBe(403);
});

test('the recommendation API answers per case for an engineer and refuses a contractor', async ({
  page,
  baseURL,
  playwright,
}) => {
  const anon = await playwright.request.newContext({ baseURL });
  const rc = {
    id: 'chw-2in',
    geometry: 'horizontal-pipe',
    nps: '2',
    normalTempC: 12,
    purposes: ['condensationControl'],
  };
  expect((await anon.post('/api/v1/recommend', { data: [rc], headers: { origin: baseURL! } })).status()).toBe(
    401,
  );
  await anon.dispose();
  const u = demo('engineer');
  await signIn(page, u.email, u.password);
  const res = await page.request.post('/api/v1/recommend', {
    data: [rc, { id: 'bad', geometry: 'horizontal-pipe', normalTempC: 80, purposes: ['heatConservation'] }],
    headers: { origin: baseURL! },
  });
  expect(res.status()).toBe(200);
  const [a, b] = await res.json();
  // 12 °C chilled water under the default condensation day (30 °C, 80 % RH: dew point 26.2 °C) needs insulation.
  expect(a.id).toBe('chw-2in');
  expect(a.governing).toBe('condensation');
  expect(a.criteria.condensation.surfaceTempC).toBeGreaterThanOrEqual(a.criteria.condensation.limitC);
  expect(b).toEqual({ id: 'bad', error: 'pipeOuterDiameterMm: a pipe needs pipeOuterDiameterMm or nps' });
  await page.getByRole('button', { name: 'Sign out' }).click();
  const c = demo('contractor');
  await signIn(page, c.email, c.password);
  expect(
    (await page.request.post('/api/v1/recommend', { data: [rc], headers: { origin: baseURL! } })).status(),
  ).toBe(403);
});
