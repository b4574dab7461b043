import Link from 'next/link';
import { Wordmark } from '@/components/logo';

export default function Home() {
  return (
    <div className="min-h-screen bg-ink-50">
      <header className="flex items-center justify-between px-8 py-5">
        <Wordmark />
        <nav className="flex gap-3 text-sm">
          <Link href="/sign-in" className="btn-quiet">
            Sign in
          </Link>
          <Link href="/sign-up" className="btn-primary">
            Create an organization
          </Link>
        </nav>
      </header>
      <main className="mx-auto max-w-3xl px-8 pt-16">
        <h1 className="text-3xl">Insulation specified line by line, checked and quantified.</h1>
        <p className="mt-4 text-lg text-ink-700">
          Lagwise is for the insulation and piping engineers of plant owners and engineering contractors who
          must specify the insulation of every hot and cold line and vessel. Upload the line list, and Lagwise
          solves each line for personnel protection, condensation control, heat-loss limits, freeze time and
          economic thickness, keeps the plant inside its heat-loss budget, takes the safety reviewer&apos;s
          sign-off and hands the contractor a bill of quantities.
        </p>
        <div className="caution mt-10 max-w-2xl">
          Results are engineering estimates by published methods (ASTM C680, ISO 12241). Material data are
          typical values to verify with the manufacturer; personnel-protection and condensation decisions
          follow local codes and a qualified person.
        </div>
      </main>
    </div>
  );
}
