/** The cautions shown wherever results are shown. */
export function ResultCautions() {
  return (
    <div className="caution text-xs leading-relaxed" role="note" aria-label="Cautions">
      Results are estimates by published methods (ASTM C680 / ISO 12241 conduction, Churchill–Chu and
      Churchill–Bernstein films, IAPWS-IF97 steam). Material data are typical values — verify them with the
      manufacturer. Personnel-protection and condensation decisions follow local codes and a qualified person.
    </div>
  );
}
