// Cautions that apply to any grazing decision, shown plainly wherever a plan is made (the calculator, a block,
// a bid). Each defers to the label, local rules and licensed advice; sources are those in shared/TRADE.md.

export interface Caution {
  key: string;
  tone: 'danger' | 'caution' | 'info';
  title: string;
  text: string;
}

export const GENERAL_GRAZING_CAUTIONS: readonly Caution[] = [
  {
    key: 'pesticide-label',
    tone: 'danger',
    title: 'Pesticide labels set when animals may graze',
    text:
      'Many labels say "do not graze treated areas" or "do not graze within N days", some for up to 18 months (US EPA Label Review Manual, ch. 11). ' +
      'The label is the law: check every product applied to the block before animals go in.',
  },
  {
    key: 'copper-sheep',
    tone: 'danger',
    title: 'Copper sprays and sheep',
    text:
      'Sheep tolerate far less dietary copper than cattle (Duncan, In Practice 19(9), 1997); vineyard and orchard copper sprays are the main exposure. ' +
      'Limit the stay on copper-sprayed blocks and ask your veterinarian.',
  },
  {
    key: 'harvest-food-safety',
    tone: 'caution',
    title: 'Out well before harvest',
    text:
      'The FDA Produce Safety Rule (21 CFR 112, subpart I) requires assessing animal intrusion before harvest; organic rules use 90/120 days after manure (7 CFR 205.203), ' +
      'and many handlers set their own removal dates. Follow your buyer, certifier and local rules.',
  },
  {
    key: 'residual',
    tone: 'info',
    title: 'Move on residual, not the calendar',
    text: 'Stop at about 2–3 in of stubble and leave trampled residue on the soil (rule of thumb). Check the ground daily; figures here are estimates.',
  },
  {
    key: 'animals-people',
    tone: 'info',
    title: 'Water, heat, fencing and the public',
    text: 'Water in every cell, shade in heat, warning signs on electric fence where people pass, and guard against predators. Keep animals out of young plantings and off vines after bud break.',
  },
];
