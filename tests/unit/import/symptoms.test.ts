import { describe, expect, test } from "vitest";

import { SYMPTOMS, type Symptom } from "@/db/schema/records";
import { buildPhraseClassifier } from "@/lib/import/phrase-rules";
import { parseSymptom, symptomFromText } from "@/lib/import/symptoms";

// Sources: the phrases are ordinary shop English ("common practice"); which symptom each maps
// to, and the order of the rules, are "Recurra's rule" (lib/import/symptoms.ts).

/** Complaint text → expected symptom. Recurra's rule, over common-practice shop phrases. */
const PHRASES: readonly (readonly [string, Symptom])[] = [
  ["Engine stalls at stop lights", "stall"],
  ["Dies at idle", "stall"],
  ["Engine cuts out on the motorway", "stall"],
  ["Vehicle shut off while driving", "stall"],
  ["Starts then dies", "stall"],
  ["Won't crank", "no-start"],
  ["wont start in the morning", "no-start"],
  ["Cranks no start", "no-start"],
  ["Cranks but will not start", "no-start"],
  ["Hard start when cold", "no-start"],
  ["Dead battery, needed a jump", "no-start"],
  ["Just clicks when key turned", "no-start"],
  ["Hard shifts 2-3", "shift-quality"],
  ["Transmission slipping", "shift-quality"],
  ["Delayed engagement into reverse", "shift-quality"],
  ["Heavy steering at low speed", "steering-assist-loss"],
  ["EPS light on", "steering-assist-loss"],
  ["Lost power steering", "steering-assist-loss"],
  ["Check engine light on", "warning-lamp"],
  ["MIL on", "warning-lamp"],
  ["ABS light came on", "warning-lamp"],
  ["Blows fuse for the radio", "electrical-accessory"],
  ["Radio dead", "electrical-accessory"],
  ["Passenger window inoperative", "electrical-accessory"],
  ["Squeal from front on braking", "noise"],
  ["Clunk over bumps", "noise"],
  ["Rattle from dash", "noise"],
  ["Oil drip under engine", "leak"],
  ["Coolant leak at hose", "leak"],
  ["Strong fuel smell after fill-up", "leak"],
  ["Running hot in traffic", "overheating"],
  ["Overheating on hills", "overheating"],
  ["Temp gauge in the red", "overheating"],
  ["Lack of power on hills", "lack-of-power"],
  ["Hesitates on acceleration", "lack-of-power"],
  ["Goes into limp mode", "lack-of-power"],
  ["Rough idle", "rough-running"],
  ["Misfires under load", "rough-running"],
  ["Engine runs rough when warm", "rough-running"],
  ["Customer states vehicle pulls right", "other"],
  ["PM service", "other"],
];

describe("symptomFromText", () => {
  test.each(PHRASES)("%s → %s", (text, expected) => {
    // Recurra's rule over common-practice shop phrases
    expect(symptomFromText(text)).toBe(expected);
  });

  test("specific beats generic", () => {
    // Recurra's rule: the rule order, not the word order, decides
    expect(symptomFromText("Stalls after refuelling, engine light on")).toBe("stall");
    expect(symptomFromText("Engine light on, stalls after refuelling")).toBe("stall");
    expect(symptomFromText("Check engine light, rough idle")).toBe("rough-running");
    expect(symptomFromText("EPS light on, heavy steering")).toBe("steering-assist-loss");
    expect(symptomFromText("Coolant leak, now running hot")).toBe("overheating");
    expect(symptomFromText("Stalls, then cranks no start")).toBe("stall");
  });

  test("accessories that cut out or die are not engine stalls", () => {
    // Recurra's rule
    expect(symptomFromText("Radio cuts out")).toBe("electrical-accessory");
    expect(symptomFromText("Wipers stopped running")).toBe("electrical-accessory");
    expect(symptomFromText("Battery dies overnight")).toBe("no-start");
    expect(symptomFromText("No power to windows")).toBe("electrical-accessory");
    expect(symptomFromText("Drive belt slipping, squeals")).toBe("noise");
  });

  test("case, apostrophes and punctuation do not matter", () => {
    // Recurra's rule
    expect(symptomFromText("WON’T START")).toBe("no-start");
    expect(symptomFromText("doesn't start")).toBe("no-start");
    expect(symptomFromText("no-start")).toBe("no-start");
    expect(symptomFromText("STALLING!!!")).toBe("stall");
  });

  test("empty text is other", () => {
    // Recurra's rule
    expect(symptomFromText("")).toBe("other");
    expect(symptomFromText(null)).toBe("other");
    expect(symptomFromText("   ")).toBe("other");
  });
});

describe("parseSymptom", () => {
  test("Recurra's values, with spaces or underscores for dashes, any case", () => {
    // Recurra's own symptom list (db/schema/records.ts)
    for (const s of SYMPTOMS) expect(parseSymptom(s)).toBe(s);
    expect(parseSymptom("No Start")).toBe("no-start");
    expect(parseSymptom("warning_lamp")).toBe("warning-lamp");
    expect(parseSymptom(" STEERING ASSIST LOSS ")).toBe("steering-assist-loss");
  });

  test("a few synonyms; anything else is null", () => {
    // Recurra's rule
    expect(parseSymptom("stalling")).toBe("stall");
    expect(parseSymptom("misfire")).toBe("rough-running");
    expect(parseSymptom("MIL")).toBe("warning-lamp");
    expect(parseSymptom("transmission")).toBe("shift-quality");
    expect(parseSymptom("overheated")).toBe("overheating");
    expect(parseSymptom("wobbly")).toBeNull();
    expect(parseSymptom("")).toBeNull();
  });
});

describe("buildPhraseClassifier", () => {
  const classify = buildPhraseClassifier([
    ["a", ["first second", "!not lead*"]],
    ["b", ["alpha beta? gamma", "omega !stop"]],
  ]);

  test("phrases, prefixes, optional words and exclusions", () => {
    // Recurra's rule (phrase notation in lib/import/phrase-rules.ts)
    expect(classify("the first second")).toBe("a");
    expect(classify("first then second")).toBeNull();
    expect(classify("leading")).toBe("a");
    expect(classify("not leading")).toBeNull();
    expect(classify("alpha gamma")).toBe("b");
    expect(classify("alpha beta gamma")).toBe("b");
    expect(classify("alpha delta gamma")).toBeNull();
    expect(classify("omega")).toBe("b");
    expect(classify("omega stop")).toBeNull();
    expect(classify("alpha gamma, first second")).toBe("a");
  });

  test("long texts and apostrophes", () => {
    // Recurra's rule: any number of words; apostrophes inside words vanish
    const filler = "word ".repeat(500);
    expect(classify(`${filler}first second`)).toBe("a");
    expect(classify(`${filler}first`)).toBeNull();
    expect(classify("o'mega")).toBe("b");
    expect(classify("'omega'")).toBe("b");
  });

  test("malformed phrases are refused when the rules are built", () => {
    // Recurra's rule
    expect(() => buildPhraseClassifier([["x", ["maybe? word"]]])).toThrow(/required word/);
    expect(() => buildPhraseClassifier([["x", ["Upper"]]])).toThrow(/bad word/);
  });
});
