/**
 * Recurra's keyword rules that read a symptom from a complaint written in ordinary shop
 * English, and the reader for a symptom column.
 */
import { SYMPTOMS, type Symptom } from "@/db/schema/records";
import { memoText } from "./memo";
import { buildPhraseClassifier } from "./phrase-rules";

/** Negations before a verb; apostrophes are dropped when words are split ("won't" → "wont"). */
const NOT1 = "wont|doesnt|didnt|cant|cannot|not|wouldnt|isnt";
const NOT2 = ["will|does|did|would not", "fail|fails|failed to"];
/** `verbs` after any negation: "won't start", "will not start", "fails to start". */
const negated = (verbs: string) => [`${NOT1} ${verbs}`, ...NOT2.map((n) => `${n} ${verbs}`)];

/** Words whose "cutting out" or "dying" is an accessory fault, not an engine stall. */
const ACCESSORY =
  "radio|stereo|wiper|wipers|light|lights|lamp|lamps|heater|blower|fan|display|screen|speaker|speakers|gauge|gauges|cluster|battery|phone|ac|c|window|windows|lock|locks|horn|mirror|mirrors|camera";

const FLUIDS = "oil|coolant|antifreeze|fluid|water|atf";

/**
 * Recurra's ordered rules (phrase notation in phrase-rules.ts): the first rule with a phrase
 * in the text decides, so specific events come before generic ones ("stalls after refuelling,
 * engine light on" is a stall; "check engine light, rough idle" is rough running; a lamp alone
 * is a warning lamp).
 */
const RULES: readonly (readonly [Symptom, readonly string[]])[] = [
  [
    "stall",
    [
      "stall*",
      "start|starts|started and|then|but dies|died|quits|quit|cuts",
      `!${ACCESSORY} cuts|cut|cutting out|off`,
      `!${ACCESSORY} dies|died|dying`,
      `!${ACCESSORY} shuts|shut off|down`,
      `!${ACCESSORY} stops|stopped|quits|quit running`,
      "engine quits|quit",
      "quits|quit while|when driving",
    ],
  ],
  [
    "no-start",
    [
      "no|non start|crank",
      "nostart|nocrank",
      ...negated("start|crank|fire"),
      ...negated("turn over"),
      "crank|cranks|cranking but? no|not? start|fire",
      "hard start|starting",
      "hard to start",
      "slow crank*",
      "crank|cranks slow*",
      "dead|flat|weak battery",
      "battery is|was|went|keeps? dead|flat|dies|died|dying",
      "battery goes|went flat",
      "need|needs|needed a? jump*",
      "jump start*",
      "jumpstart*",
      "just|only click|clicks",
      "click|clicks but? no",
    ],
  ],
  [
    "overheating",
    [
      "overheat*",
      "over heat*",
      "running|runs|getting|gets|engine hot",
      "temp|temperature gauge? high|rising|climbs|climbing|red|warning|light|lamp",
      "temp|temperature gauge? goes up",
      "temp|temperature gauge? in the red",
      "high|hot engine|coolant? temp*",
      "boil|boils|boiled|boiling over",
      "coolant is? boiling",
    ],
  ],
  [
    "steering-assist-loss",
    [
      "heavy|stiff|hard|tight steering",
      "steering is|feels|went|goes|gets|got? heavy|stiff|hard|tight",
      "hard to steer",
      "lost|lose|loses|losing|no power|electric|assisted? steering",
      "loss of power|electric|assisted? steering",
      "steering assist*",
      "assist lost|loss",
      "eps|epas",
      "power steering fail*|loss|warning|light|fault|inop*",
    ],
  ],
  [
    "shift-quality",
    [
      "hard|harsh|rough|late|early|erratic|delayed|slow|firm|jerky|clunky shift|shifts|shifting|upshift*|downshift*|engagement",
      "hard|harsh|rough|late|early|erratic|delayed|slow|firm|jerky|clunky gear change|changes",
      "shift|shifts|shifting hard|harsh|rough|late|early|erratic|erratically|firm|poorly",
      "!belt|belts slip|slips|slipping|slipped",
      "flare|flares between|on|when",
      "rpm flare*",
      "bang|bangs|clunk|clunks|slam|slams|jerk|jerks|thump|thumps into gear|drive|reverse",
      ...negated("shift|upshift|downshift|engage"),
      ...negated("go into gear"),
      "no reverse|drive|upshift",
      "pops|jumps|popped|jumped out of gear",
      "stuck in gear|first|second|third|1st|2nd|3rd",
    ],
  ],
  [
    "lack-of-power",
    [
      "lack|loss of power",
      "power loss",
      "lost|loses|losing|low|reduced|no power !to|window|windows|lock|locks|outlet|socket|steering",
      "underpower*",
      "under power*",
      "sluggish*",
      "hesitat*",
      "bog|bogs down",
      "bogging",
      "poor acceleration",
      "slow to accelerate",
      "no pickup",
      "no pick up",
      "gutless",
      ...negated("accelerate"),
      "limp mode|home",
    ],
  ],
  [
    "rough-running",
    [
      "rough idle|idling|running|run",
      "runs|running|idles|idling|idle|engine rough|roughly|poorly|badly|bad|erratic|erratically|unevenly|lumpy",
      "misfir*",
      "engine miss|misses|missing",
      "miss|misses|missing at|on|under|when|while",
      "sputter*",
      "stumbl*",
      "surge|surges|surging",
      "buck|bucks|bucking",
      "jerk|jerks|jerking|jerky",
      "shake|shakes|shaking|vibrat* at|on|when idle",
      "engine shakes|shaking|vibrat*",
      "erratic|hunting|unstable|fluctuating|surging idle",
      "idle hunts|hunting|surges|fluctuates|drops",
      "runs lean|rich",
      "black smoke",
      "backfir*",
    ],
  ],
  [
    "leak",
    [
      "leak*",
      "drip*",
      "puddle*",
      "seep*",
      "weep|weeps|weeping",
      `losing|loses|lost|using|uses|burning|burns ${FLUIDS}`,
      `low on ${FLUIDS}`,
      `loss of ${FLUIDS}`,
      `topping up ${FLUIDS}`,
      "fuel|gas|petrol|diesel smell|smells|odor|odour",
      "raw fuel smell|odor|odour",
      "smell|smells of|like? fuel|gas|petrol|diesel",
      "spot|spots on|under the? ground|floor|driveway",
      "wet under|below|around",
    ],
  ],
  [
    "electrical-accessory",
    [
      "fuse|fuses|radio|stereo*|headunit|window|windows|wiper|wipers|horn|headlight*|headlamp*|taillight*|taillamp*|hazard|hazards|bulb|bulbs|blower*|mirror|mirrors|camera|display|screen|parasitic|electrical|cluster|flicker*",
      "head unit",
      "head|tail light|lights|lamp|lamps",
      "door lock|locks",
      "central locking",
      "turn signal|signals",
      "interior|dome light|lights",
      "dash|dashboard|light|lights flicker*|dim*|out",
      "dash|dashboard light|lights flicker*|dim*|out",
      "heater fan",
      "power outlet",
      "usb|12v port|socket|outlet",
      "12 v port|socket|outlet",
      "battery drain*",
      "drain|drains|draining the? battery",
      "short|shorted circuit",
      "short|shorted to ground",
      "shorted",
      "no power to",
      "gauge|gauges dead|inop*|erratic",
      "gauge|gauges not working",
    ],
  ],
  [
    "noise",
    [
      "nois*|squeal*|squeak*|clunk*|rattl*|knock*|grind*|whine|whines|whining|howl*|groan*|creak*|hum|hums|humming|click|clicks|clicking|tick|ticks|ticking|thump*|bang|bangs|banging|scrape|scrapes|scraping|chirp*|hiss*|buzz*|pop|pops|popping|loud|sound*",
    ],
  ],
  [
    "warning-lamp",
    [
      "check engine",
      "cel|mil|ses",
      "malfunction indicator",
      "service engine",
      "engine light|lamp",
      "warning light|lamp|message|on",
      "dash|dashboard light|lights|warning|warnings",
      "light|lights|lamp|lamps|indicator|indicators|icon|telltale is|are|came|comes|coming|stays|stay|went|goes|keeps? on|lit|illuminated|flashing|blinking",
      "abs|tpms|srs|airbag|traction|esc|esp|oil|battery|charging|brake|dpf|emission|emissions light|lamp|warning|indicator",
      "traction control light|lamp|warning|indicator",
      "tyre|tire pressure light|lamp|warning",
      "glow plug light|lamp",
      "code|codes stored|present|set",
      "fault code|codes",
    ],
  ],
];

const classify = memoText(buildPhraseClassifier(RULES));

/**
 * The symptom a complaint describes, by Recurra's ordered keyword rules (specific before
 * generic); "other" when no rule matches or the text is empty.
 */
export function symptomFromText(text: string | null | undefined): Symptom {
  if (!text) return "other";
  return classify(text) ?? "other";
}

/** Words people put in a symptom column that are not Recurra's own values. */
const SYMPTOM_SYNONYMS: ReadonlyMap<string, Symptom> = new Map<string, Symptom>([
  ["stalling", "stall"],
  ["stalls", "stall"],
  ["stalled", "stall"],
  ["nostart", "no-start"],
  ["non-start", "no-start"],
  ["wont-start", "no-start"],
  ["crank-no-start", "no-start"],
  ["rough", "rough-running"],
  ["rough-idle", "rough-running"],
  ["runs-rough", "rough-running"],
  ["misfire", "rough-running"],
  ["power-loss", "lack-of-power"],
  ["loss-of-power", "lack-of-power"],
  ["low-power", "lack-of-power"],
  ["hesitation", "lack-of-power"],
  ["mil", "warning-lamp"],
  ["mil-on", "warning-lamp"],
  ["check-engine", "warning-lamp"],
  ["check-engine-light", "warning-lamp"],
  ["warning-light", "warning-lamp"],
  ["lamp", "warning-lamp"],
  ["shifting", "shift-quality"],
  ["shift", "shift-quality"],
  ["transmission", "shift-quality"],
  ["steering", "steering-assist-loss"],
  ["power-steering", "steering-assist-loss"],
  ["steering-assist", "steering-assist-loss"],
  ["electrical", "electrical-accessory"],
  ["accessory", "electrical-accessory"],
  ["noisy", "noise"],
  ["leaking", "leak"],
  ["leaks", "leak"],
  ["overheat", "overheating"],
  ["overheated", "overheating"],
  ["running-hot", "overheating"],
]);

const SYMPTOM_SET: ReadonlySet<string> = new Set(SYMPTOMS);
const SEPARATORS = /[\s_/]+/g;

/**
 * A symptom column's value: one of SYMPTOMS in any case, with spaces or underscores for the
 * dashes ("No Start", "warning_lamp"), or a common synonym ("stalling", "misfire", "MIL").
 * Null for anything else; the row reader then falls back to the complaint text.
 */
export function parseSymptom(raw: string): Symptom | null {
  const s = raw.trim().toLowerCase().replace(SEPARATORS, "-");
  if (SYMPTOM_SET.has(s)) return s as Symptom;
  return SYMPTOM_SYNONYMS.get(s) ?? null;
}
