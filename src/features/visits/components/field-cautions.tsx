import { Caution } from '@/components/ui/caution';

// Short cautions placed next to the step where the risk is (DESIGN.md). They point to the rules that
// govern the work; they never replace them.
export type FieldCautionTopic = 'electrical' | 'discharge' | 'backdraft' | 'heights' | 'action_level';

const CAUTIONS: Record<FieldCautionTopic, { title: string; text: string }> = {
  electrical: {
    title: 'Fan wiring is electrical work',
    text: 'Follow the local electrical code: power the fan from a dedicated, labelled circuit or the junction box the builder left, and have a licensed electrician do it where the code asks for one.',
  },
  discharge: {
    title: 'Where the vent discharges',
    text: 'Discharge above the roof edge and away from windows, doors and air intakes, at the heights and distances the applicable mitigation standard and local code set.',
  },
  backdraft: {
    title: 'Check combustion appliances',
    text: 'Lowering the pressure under the slab can pull flue gases back into the home. Once the fan runs, check the furnace, water heater and any other fuel-burning appliance for backdrafting.',
  },
  heights: {
    title: 'Attic heat, ladders and roofs',
    text: 'Attics can get hot enough to cause heat illness, and ladders and roofs are where falls happen: take water and breaks, set ladders on firm footing, and follow your fall-protection practice.',
  },
  action_level: {
    title: 'Result at or above the action level',
    text: 'Retest after any change to the system. Results above the action level call for a certified or licensed mitigation professional to assess and fix the home.',
  },
};

/** One field caution; each ends by deferring to local codes and licensed practice. */
export function FieldCaution({ topic }: { topic: FieldCautionTopic }) {
  const { title, text } = CAUTIONS[topic];
  return (
    <Caution title={title}>
      {text} Local codes and licensed practice come first.
    </Caution>
  );
}
