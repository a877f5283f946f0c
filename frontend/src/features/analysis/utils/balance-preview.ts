// A balance computed in the browser from saved stable values, with the same common functions the
// server uses when the balance is saved.
import type { BalanceInput, BalanceOutput, MeasuredValue, StableValueAnalysis } from '@dialsheet/common';
import { energyBalance, massBalance, measuredFromBudget } from './analysis-lib';
import { thrownMessage } from './number-format';

function measured(analyses: ReadonlyMap<string, StableValueAnalysis>, id: string | null | undefined, what: string): MeasuredValue {
  if (!id) throw new Error(`${what}: choose a saved stable value`);
  const analysis = analyses.get(id);
  if (!analysis) throw new Error(`${what}: the stable value it used is no longer there; choose another`);
  if (!analysis.result) throw new Error(`${what}: “${analysis.name}” has no result (${analysis.error ?? 'not computed'}); recompute it first`);
  return measuredFromBudget(analysis.result.stable.budget);
}

export function computeBalance(
  input: BalanceInput,
  analyses: ReadonlyMap<string, StableValueAnalysis>,
): { output: BalanceOutput | null; error: string | null } {
  try {
    const options = { coverageFactor: input.coverageFactor ?? undefined };
    const mass = massBalance(
      input.streams.map((s) => ({ id: s.id, label: s.label, side: s.side, massFlow: measured(analyses, s.massFlowAnalysisId, `${s.label} mass flow`) })),
      options,
    );
    let energy = null;
    if (input.energy) {
      if (!input.enthalpyModel) throw new Error('choose an enthalpy model for the energy balance');
      energy = energyBalance(
        input.streams.map((s) => ({
          id: s.id,
          label: s.label,
          side: s.side,
          massFlow: measured(analyses, s.massFlowAnalysisId, `${s.label} mass flow`),
          temperature: measured(analyses, s.temperatureAnalysisId, `${s.label} temperature`),
          minusTemperature: s.minusTemperatureAnalysisId ? measured(analyses, s.minusTemperatureAnalysisId, `${s.label} second temperature`) : null,
        })),
        input.enthalpyModel,
        options,
      );
    }
    return { output: { mass, energy }, error: null };
  } catch (error) {
    return { output: null, error: thrownMessage(error) };
  }
}
