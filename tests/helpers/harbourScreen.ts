/**
 * The invented harbour stage LED wall the configuration, push and notification tests share: a
 * screen on two towers with a "lowered" configuration, and levels whose second action lowers it.
 * Its limits are hand-worked in tests/unit/configuration.test.ts (EN 1991-1-4 §7.4.3 c_f 1.80 with
 * the ±0.25·b eccentricity, γ 1.5): raised 14.75 m/s, lowered 18.43 m/s at 1.225 kg/m³.
 */
export const harbourScreen = {
  kind: 'screen',
  name: 'Harbour stage LED wall',
  configurationName: 'raised',
  widthM: 6,
  heightM: 4,
  bottomHeightM: 3,
  supportTowers: 2,
  towerMassKg: 400,
  screenMassKg: 600,
  outriggerDepthM: 3,
  ballastPerTowerKg: 1500,
  frictionCoefficient: 0.7,
  towerWidthM: 0,
  headerTrussDepthM: 0,
  configurations: [{ name: 'lowered', changes: { bottomHeightM: 1.2 } }],
};

/** Prepare at 50 %, Lower the screen at 70 % (moves it to "lowered"), Stop and clear at 90 % of capacity. */
export const harbourLevels = [
  { label: 'Prepare', trigger: { kind: 'utilization', fraction: 0.5 }, actionText: 'Crew to the screen; clear the area behind it.' },
  { label: 'Lower the screen', trigger: { kind: 'utilization', fraction: 0.7 }, actionText: 'Lower the LED wall to its bottom stop.', moveToConfiguration: 'lowered' },
  { label: 'Stop and clear', trigger: { kind: 'utilization', fraction: 0.9 }, actionText: 'Stop the show; clear 1.5 × height around the wall.' },
];

/** The same without configurations and moves (the notification tests' screen). */
export const harbourScreenPlain = (() => {
  const { configurations: _configurations, ...rest } = harbourScreen;
  return rest;
})();
export const harbourLevelsPlain = harbourLevels.map(({ moveToConfiguration: _move, ...rest }) => rest);
