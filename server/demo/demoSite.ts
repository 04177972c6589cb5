/**
 * The demo scenario, invented for this product: Brackenfold Common, a village green hosting a
 * two-day summer fair, with a food marquee, a mesh fence along the north boundary, a stage-side
 * LED screen, a bandstand shell and a sponsor's arch, three anemometers on site, and one
 * gateway. Demo only: none of these numbers describe a real structure.
 *
 * The wind action plan moves three structures to another configuration at Prepare, and at Stop
 * and clear when the wind jumped past Prepare (design §2.5):
 * the marquee takes all four side walls off ("sides off"), the fence loses its scrim ("scrim
 * removed": the bare mesh panels stay), the LED screen comes down to its bottom stop ("lowered").
 * Each configuration is the same record with the kind's own fields changed, assessed by the same
 * engine; README "The demo" gives their limits and what governs.
 */
import type { StructureInput } from '../register/structures.ts';
import type { SensorInput } from '../register/sensors.ts';

export const demoSiteName = 'Brackenfold Common — Summer Fair (demo)';
export const demoTimeZone = 'Europe/London';

export const demoSensors: SensorInput[] = [
  { key: 'north-mast', name: 'North mast', heightM: 10, location: 'Mast by the north fence, clear of the trees', latDeg: null, lonDeg: null, unit: 'm/s', mode: 'samples', silenceTimeoutMs: 30_000 },
  { key: 'stage-roof', name: 'Stage roof', heightM: 8, location: 'Upwind corner of the stage roof', latDeg: null, lonDeg: null, unit: 'kn', mode: 'samples', silenceTimeoutMs: 30_000 },
  { key: 'east-gate', name: 'East gate pole', heightM: 4, location: 'Pole at the east gate', latDeg: null, lonDeg: null, unit: 'km/h', mode: 'samples', silenceTimeoutMs: 30_000 },
];

export const demoGatewayUsername = 'brackenfold-gw';

/** Demo sign-ins (documented in the README as demo only). */
export const demoPeople = [
  { username: 'admin', displayName: 'Fair office (admin)', role: 'admin' as const, password: 'demo-admin-only' },
  { username: 'cp', displayName: 'Dana Whitlock (competent person)', role: 'competent-person' as const, password: 'demo-competent-person' },
  { username: 'crew', displayName: 'Sam Okoro (site crew)', role: 'crew' as const, password: 'demo-crew-member' },
  { username: 'steward', displayName: 'Gate steward', role: 'viewer' as const, password: 'demo-steward-view' },
];

const demoSource = 'demo data: invented for the Brackenfold demo site';

export const demoStructures: StructureInput[] = [
  {
    record: {
      kind: 'tent',
      name: 'Food hall marquee',
      lengthM: 18,
      widthM: 9,
      eaveHeightM: 2.5,
      ridgeHeightM: 4.6,
      wallsClosed: true,
      legs: 14,
      ballastPerLegKg: 1000,
      selfWeightKg: 1600,
      surface: 'grass',
      configurationName: 'sides on',
      // All four sides open: a canopy. Less wall area for the drag, more roof lift (EN 1991-1-4
      // §7.3 canopy net lift): the engine weighs both (README "The demo").
      configurations: [{ name: 'sides off', changes: { wallsClosed: false } }],
    },
    orientationDeg: 250,
    location: 'West lawn',
    latDeg: null,
    lonDeg: null,
    mobile: false,
    sensorKeys: null,
    levels: [
      { label: 'Watch', trigger: { kind: 'utilization', fraction: 0.6 }, actionText: 'Walk round the marquee: leg weights, pegs, ratchet straps and guy lines tight. Tell the caterers the wind is rising.' },
      {
        label: 'Prepare',
        trigger: { kind: 'utilization', fraction: 0.8 },
        actionText:
          'Take all four side walls off the marquee, the downwind side first and the side facing the wind last: one open side facing the wind with the others closed lifts the roof most. Brief the stewards on the exits.',
        moveToConfiguration: 'sides off',
      },
      {
        label: 'Stop and clear',
        trigger: { kind: 'utilization', fraction: 1 },
        actionText: 'Empty the marquee: caterers to the barn, tape off the lawn downwind of the marquee at least as deep as it is tall. If the side walls are still on and the crew can reach them from outside, take them off, downwind side first.',
        moveToConfiguration: 'sides off',
      },
    ],
  },
  {
    record: {
      kind: 'banner',
      name: 'North fence scrim',
      widthM: 24,
      heightM: 2.2,
      clearanceM: 0.1,
      solidity: 0.55,
      feet: 13,
      ballastPerFootKg: 250,
      footDepthM: 1.4,
      selfWeightKg: 380,
      surface: 'grass',
      configurationName: 'scrim on',
      // The bare mesh panels without the scrim: solidity 0.2 (demo value for welded mesh panels, invented).
      configurations: [{ name: 'scrim removed', changes: { solidity: 0.2 } }],
    },
    orientationDeg: 0,
    location: 'North boundary',
    latDeg: null,
    lonDeg: null,
    mobile: false,
    sensorKeys: ['north-mast'],
    levels: [
      { label: 'Watch', trigger: { kind: 'utilization', fraction: 0.6 }, actionText: 'Walk the fence line: check feet, ballast and cable ties. Keep the gate crew informed.' },
      {
        label: 'Prepare',
        trigger: { kind: 'utilization', fraction: 0.8 },
        actionText: 'Take the scrim off the fence: cut the ties bay by bay, drop it to the ground and roll it; the bare mesh panels stay. Keep the public back from the fence while you work.',
        moveToConfiguration: 'scrim removed',
      },
      {
        label: 'Stop and clear',
        trigger: { kind: 'utilization', fraction: 1 },
        actionText: 'Take the scrim off if it is still on. Close the path along the north fence and keep everyone a fence height clear of it.',
        moveToConfiguration: 'scrim removed',
      },
    ],
  },
  {
    record: {
      kind: 'screen',
      name: 'Stage-left LED screen',
      widthM: 5,
      heightM: 3,
      bottomHeightM: 3.5,
      supportTowers: 2,
      towerMassKg: 450,
      screenMassKg: 900,
      outriggerDepthM: 3,
      ballastPerTowerKg: 1000,
      ratedGustMps: 20,
      // Rubber pads under the outrigger feet on the trackway: μ 0.6 (common practice value, from
      // memory; on site, the pad maker's figure or a pull test). With bare steel feet on the hard
      // trackway (μ 0.3) the towers slide first and lowering the screen would gain nothing.
      frictionCoefficient: 0.6,
      configurationName: 'raised',
      // Down to its bottom stop: the board's foot 0.5 m above the trackway.
      configurations: [{ name: 'lowered', changes: { bottomHeightM: 0.5 } }],
    },
    orientationDeg: 180,
    location: 'Stage left, on the trackway',
    latDeg: null,
    lonDeg: null,
    mobile: false,
    sensorKeys: ['stage-roof', 'north-mast'],
    levels: [
      { label: 'Watch', trigger: { kind: 'utilization', fraction: 0.6 }, actionText: 'Check the tower ballast, the outrigger pads and the ties of the LED screen. Tell the stage manager the wind is rising.' },
      {
        label: 'Prepare',
        trigger: { kind: 'utilization', fraction: 0.8 },
        actionText: 'Lower the LED screen to its bottom stop (content off first). Keep the crew at the towers and nobody behind the screen.',
        moveToConfiguration: 'lowered',
      },
      {
        label: 'Stop and clear',
        trigger: { kind: 'utilization', fraction: 1 },
        actionText: 'Stop the show. Lower the LED screen to its bottom stop if it is not down yet; then nobody in front of or behind the towers: tape off a zone at least as deep as the screen is tall.',
        moveToConfiguration: 'lowered',
      },
    ],
  },
  {
    record: {
      kind: 'shell',
      name: 'Bandstand shell',
      radiusM: 4,
      form: 'open',
      selfWeightKg: 2400,
      frontBallastKg: 800,
      backBallastKg: 1800,
      surface: 'grass',
    },
    orientationDeg: 90,
    location: 'East end of the green',
    latDeg: null,
    lonDeg: null,
    mobile: false,
    sensorKeys: null,
    levels: null,
  },
  {
    record: {
      kind: 'custom',
      name: 'Sponsor arch',
      baseDepthM: 1.5,
      baseWidthM: 6,
      faces: [
        { label: 'header panel 6 × 1 m', areaM2: 6, centroidHeightM: 3.5, cfFront: 1.8, cfBack: 1.8 },
        { label: 'two legs 0.4 × 3 m', areaM2: 2.4, centroidHeightM: 1.5, cfFront: 1.2, cfBack: 1.2 },
        { label: 'arch seen end-on, 0.4 × 4 m', areaM2: 1.6, centroidHeightM: 2, cfFront: 1.2, cfBack: 1.2, facingDeg: 90 },
      ],
      masses: [
        { label: 'arch frame', massKg: 220, xM: 0.75, yM: 3 },
        { label: 'water ballast, front left leg', massKg: 250, xM: 0.1, yM: 0.2 },
        { label: 'water ballast, front right leg', massKg: 250, xM: 0.1, yM: 5.8 },
        { label: 'water ballast, back left leg', massKg: 250, xM: 1.4, yM: 0.2 },
        { label: 'water ballast, back right leg', massKg: 250, xM: 1.4, yM: 5.8 },
      ],
      surface: 'grass',
      coefficientSource: `${demoSource}; header panel as EN 1991-1-4 7.4.3 signboard (1.80), legs a rectangular section taken at 1.2`,
    },
    orientationDeg: 90,
    location: 'East gate',
    latDeg: null,
    lonDeg: null,
    mobile: false,
    sensorKeys: ['east-gate'],
    // Prepare on the estimate (design §2.7): the header panel takes two crew and a few minutes to
    // lay down, so the plan starts when 80 % of the arch's capacity is likely within half an hour.
    levels: [
      { label: 'Watch', trigger: { kind: 'utilization', fraction: 0.6 }, actionText: 'Walk round the arch: water ballast full, leg ties tight. Keep the queue from standing under the header.' },
      {
        label: 'Prepare',
        trigger: { kind: 'chance', fraction: 0.8, withinMinutes: 30, probability: 0.2 },
        actionText: 'Close the lane under the arch and have two crew ready to lay the header panel down on the lee side.',
      },
      { label: 'Stop and clear', trigger: { kind: 'utilization', fraction: 1 }, actionText: 'Clear everyone from within 6 m of the arch downwind. Lay the header panel down, face to the ground, and keep the lane closed.' },
    ],
  },
];

/**
 * What the demo crew wrote when they acknowledged an alert on the past day: each note is about
 * the structure that raised it, by its kind (one demo structure per kind) and level (1 Watch,
 * 2 Prepare, 3 Stop and clear), following the actions its levels ask for. Invented for the demo.
 */
const demoNotesByKind: Readonly<Record<string, Readonly<Record<number, readonly string[]>>>> = {
  tent: {
    1: ['Walked round the marquee: leg weights, pegs and guy lines tight.', 'Checked the ratchet straps and leg ballast on the west side of the marquee, all tight.'],
    2: ['All four marquee side walls off and bagged, the downwind side first; stewards briefed on the exits.', 'Marquee walls taken off, the side facing the wind last; caterers told where to go if we clear.'],
    3: ['Marquee emptied, caterers moved to the barn, side walls off from outside, zone taped off downwind of the marquee.', 'Food hall cleared and closed, marquee walls off, stewards holding the public back from the west lawn.'],
  },
  banner: {
    1: ['Walked the fence line: feet, ballast and cable ties fine.', 'Checked every foot block and clamp on the north fence, all in place.'],
    2: ['Scrim cut free and rolled off the north fence, bare mesh panels left standing, public kept back.', 'Fence scrim off bay by bay and rolled, gate crew told.'],
    3: ['Path along the north fence closed, everyone kept a fence height clear.', 'North fence path taped off, feet of the bare fence checked.'],
  },
  screen: {
    1: ['Checked the tower ballast and the outrigger pads of the LED screen, all in place.', 'Screen towers and ties checked, nothing moved.'],
    2: ['LED screen lowered to its bottom stop, crew on standby at the towers.', 'Screen content off and the screen lowered to its bottom stop, nobody behind it.'],
    3: ['Show stopped, LED screen down, nobody in front of or behind the towers.', 'Screen down and the zone round the towers taped off, stage manager told.'],
  },
  shell: {
    1: ['Checked the back ballast and the ties of the bandstand shell, all tight.', 'Walked round the shell: ballast blocks in place, no movement.'],
    2: ['Backdrop and banners taken off the bandstand shell, stewards briefed.', 'Loose kit cleared from under the shell, band told they may have to stop.'],
    3: ['Band stopped, bandstand lawn cleared and taped off downwind of the shell.', 'Audience moved off the east end of the green, nobody under the shell.'],
  },
  custom: {
    1: ['Checked the water ballast on all four legs of the arch: full, no leaks.', 'Arch legs and ballast checked at the east gate, all fine.'],
    2: ['Header panel taken off the sponsor arch, gate stewards briefed.', 'Gate path under the arch narrowed, stewards ready to close it.'],
    3: ['Gate path under the arch closed, everyone kept 5 m clear.', 'East gate moved to the side entrance, arch taped off.'],
  },
};

const demoSensorNotes: Readonly<Record<string, readonly string[]>> = {
  'no-data': ['Watched the wind with the handheld anemometer until readings came back.'],
  'sensor-silent': ['Checked the mast cable and the gateway power; readings came back.'],
  'sensor-implausible': ['Checked the anemometer cups and mounting; nothing loose.'],
};

/** The notes the demo crew choose from for an alert (its kind, the structure's kind, the level). */
export function demoAcknowledgeNotes(alertKind: string, structureKind: string | null, level: number | null): readonly string[] {
  if (alertKind === 'level' && structureKind !== null && level !== null) {
    const notes = demoNotesByKind[structureKind]?.[Math.min(3, Math.max(1, level))];
    if (notes) return notes;
  }
  return demoSensorNotes[alertKind] ?? ['Checked and logged.'];
}

/**
 * What the demo's people write about a configuration action, by the structure's kind: the late
 * action seen and acknowledged, then done after its time; and the competent person's note when
 * putting the structure back as registered after the wind has dropped. Invented for the demo.
 */
const demoConfigurationNotesByKind: Readonly<Record<string, { seenLate: string; doneLate: string; back: string }>> = {
  tent: {
    seenLate: 'Seen. Crew still at the marquee guy lines on the west side, walls come off next.',
    doneLate: 'All four marquee side walls off at last: the crew were held at the guy lines first.',
    back: 'Wind well down for twenty minutes: marquee side walls back on and laced.',
  },
  banner: {
    seenLate: 'Seen. Crew on their way to the north fence with the knives, scrim comes off next.',
    doneLate: 'Scrim off the north fence and rolled, late: the crew were held at the gate.',
    back: 'Wind well down for twenty minutes: scrim refitted on the north fence.',
  },
  screen: {
    seenLate: 'Seen. Waiting for the stage manager to cut the content before lowering the screen.',
    doneLate: 'LED screen lowered to its bottom stop, late: the content had to be cut first.',
    back: 'Wind well down for twenty minutes: LED screen raised again, towers checked.',
  },
};

const demoConfigurationNotesOther = { seenLate: 'Seen, on our way.', doneLate: 'Done, late.', back: 'Wind well down for twenty minutes: put back as registered.' };

/** The notes of the demo's configuration actions for a structure of this kind. */
export function demoConfigurationNotes(structureKind: string | null): { seenLate: string; doneLate: string; back: string } {
  return (structureKind === null ? undefined : demoConfigurationNotesByKind[structureKind]) ?? demoConfigurationNotesOther;
}
