declare module 'psychrolib' {
  const psychrolib: {
    SI: number;
    IP: number;
    SetUnitSystem(u: number): void;
    GetTDewPointFromRelHum(t: number, rh: number): number;
  };
  export default psychrolib;
}
