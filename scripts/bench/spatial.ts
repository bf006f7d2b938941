// Spatial-signature benchmark: labels 25 synthetic wafers of about 67,000 dies each (0.98 mm dies
// on a 300 mm wafer, every signature in turn) and prints the time; map synthesis is not timed.
// Two lots: one whose wafers share a die grid, as a real lot does (the grid's geometry is then
// worked out once), and one where every wafer has a grid of its own (the worst case). Each is
// labelled twice: the first pass includes the JIT warming up and collecting the garbage of what
// ran before; the second is the steady rate of a long-running app.
import { createRandom, layoutWafer } from '../../src/core/generator';
import { labelWafer, SIGNATURE_LABELS, synthesiseWafer, type SynthesisedWafer } from '../../src/core/spatial';

function labelAll(wafers: SynthesisedWafer[]): { seconds: number; correct: number } {
  const start = performance.now();
  let correct = 0;
  for (const w of wafers) if (labelWafer({ x: w.x, y: w.y, flagged: w.flagged, site: w.site }).label === w.label) correct++;
  return { seconds: (performance.now() - start) / 1000, correct };
}

function report(name: string, wafers: SynthesisedWafer[]): void {
  const dies = wafers.reduce((n, w) => n + w.x.length, 0);
  const first = labelAll(wafers);
  const second = labelAll(wafers);
  console.log(`spatial signatures, ${name}: ${wafers.length} wafers, ${dies} dies (${Math.round(dies / wafers.length)} a wafer)`);
  console.log(`  label   ${first.seconds.toFixed(3)} s first pass (JIT warm-up and garbage collection included), ${second.seconds.toFixed(3)} s second pass (${(1000 * second.seconds / wafers.length).toFixed(1)} ms a wafer); ${second.correct}/${wafers.length} labels match the planted shape`);
}

export function benchSpatial(): void {
  const layout = layoutWafer({ dieWidthMm: 0.98, dieHeightMm: 0.98 });
  const label = (w: number) => SIGNATURE_LABELS[w % SIGNATURE_LABELS.length];
  report('one lot, one die grid', Array.from({ length: 25 }, (_, w) => synthesiseWafer(label(w), createRandom(4242, w), { dieSizeMm: 0.98, layout })));
  report('a grid per wafer', Array.from({ length: 25 }, (_, w) => synthesiseWafer(label(w), createRandom(4243, w), { dieSizeMm: 0.98 })));
}
