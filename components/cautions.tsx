/** The cautions shown wherever results are shown; `compact` gives the line list one line that opens to the whole text. */
export function ResultCautions({ compact = false }: { compact?: boolean }) {
  const text = (
    <>
      Results are estimates by published methods (ASTM C680 / ISO 12241 conduction, Churchill–Chu and
      Churchill–Bernstein films, IAPWS-IF97 steam). Material data are typical values — verify them with the
      manufacturer. Personnel-protection and condensation decisions follow local codes and a qualified person.
    </>
  );
  if (compact)
    return (
      <details className="caution px-3 py-1 text-xs leading-relaxed" role="note" aria-label="Cautions">
        <summary className="cursor-pointer">
          Results are estimates: verify material data with the manufacturer; safety decisions follow local
          codes and a qualified person.
        </summary>
        <p className="mt-1">{text}</p>
      </details>
    );
  return (
    <div className="caution text-xs leading-relaxed" role="note" aria-label="Cautions">
      {text}
    </div>
  );
}
