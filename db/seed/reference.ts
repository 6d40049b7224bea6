import { sql } from "drizzle-orm";
import type { DbOrTx } from "@/db";
import { components, dtcCodes } from "@/db/schema";
import type { ComponentKind } from "@/lib/component-kinds";
import { parseDtc } from "@/lib/dtc";

/**
 * Recurra's own component list, system → component. Written for Recurra: it follows no
 * industry code table (those are licensed); organisations map their own codes onto it through
 * component aliases. The slug is the stable key that data and known issues refer to. Each has a
 * default kind (lib/component-kinds.ts): service, wear or failure; an organisation may set its own.
 */
// prettier-ignore
export const COMPONENTS = [
  { slug: "fuel-vapour/purge-valve", system: "Fuel vapour", name: "Purge valve", kind: "failure" },
  { slug: "fuel-vapour/vent-valve", system: "Fuel vapour", name: "Canister vent valve", kind: "failure" },
  { slug: "fuel-vapour/canister", system: "Fuel vapour", name: "Charcoal canister and vapour lines", kind: "failure" },
  { slug: "fuel-vapour/filler-cap", system: "Fuel vapour", name: "Filler cap and neck", kind: "failure" },
  { slug: "fuel-delivery/fuel-pump", system: "Fuel delivery", name: "Fuel pump and sender", kind: "failure" },
  { slug: "fuel-delivery/injectors", system: "Fuel delivery", name: "Injectors", kind: "failure" },
  { slug: "ignition/coils", system: "Ignition", name: "Ignition coils", kind: "failure" },
  { slug: "ignition/spark-plugs", system: "Ignition", name: "Spark plugs", kind: "service" },
  { slug: "ignition/crank-sensor", system: "Ignition", name: "Crankshaft position sensor", kind: "failure" },
  { slug: "starting-charging/battery", system: "Starting and charging", name: "Battery", kind: "failure" },
  { slug: "starting-charging/battery-cables", system: "Starting and charging", name: "Battery cables and clamps", kind: "failure" },
  { slug: "starting-charging/starter", system: "Starting and charging", name: "Starter motor", kind: "failure" },
  { slug: "starting-charging/alternator", system: "Starting and charging", name: "Alternator", kind: "failure" },
  { slug: "power-distribution/main-fuse", system: "Power distribution", name: "High-current main fuse", kind: "failure" },
  { slug: "power-distribution/accessory-fuses", system: "Power distribution", name: "Accessory circuit fuses", kind: "failure" },
  { slug: "power-distribution/relays", system: "Power distribution", name: "Relays", kind: "failure" },
  { slug: "power-distribution/body-ground", system: "Power distribution", name: "Body ground strap", kind: "failure" },
  { slug: "power-distribution/harness", system: "Power distribution", name: "Wiring harness and connectors", kind: "failure" },
  { slug: "engine-management/air-flow-sensor", system: "Engine management", name: "Air flow sensor", kind: "failure" },
  { slug: "engine-management/oxygen-sensors", system: "Engine management", name: "Oxygen sensors", kind: "failure" },
  { slug: "engine-management/throttle-body", system: "Engine management", name: "Throttle body", kind: "failure" },
  { slug: "engine-mechanical/oil-service", system: "Engine mechanical", name: "Oil and filter", kind: "service" },
  { slug: "engine-mechanical/air-filter", system: "Engine mechanical", name: "Engine air filter", kind: "service" },
  { slug: "engine-mechanical/drive-belt", system: "Engine mechanical", name: "Drive belt and tensioner", kind: "failure" },
  { slug: "engine-mechanical/valve-cover-gasket", system: "Engine mechanical", name: "Valve cover gasket", kind: "failure" },
  { slug: "engine-mechanical/engine-mounts", system: "Engine mechanical", name: "Engine mounts", kind: "failure" },
  { slug: "cooling/coolant", system: "Cooling", name: "Coolant", kind: "service" },
  { slug: "cooling/thermostat", system: "Cooling", name: "Thermostat", kind: "failure" },
  { slug: "cooling/water-pump", system: "Cooling", name: "Water pump", kind: "failure" },
  { slug: "cooling/radiator", system: "Cooling", name: "Radiator", kind: "failure" },
  { slug: "cooling/hoses", system: "Cooling", name: "Coolant hoses", kind: "failure" },
  { slug: "transmission/fluid-service", system: "Transmission", name: "Fluid and filter", kind: "service" },
  { slug: "transmission/shift-solenoids", system: "Transmission", name: "Shift solenoids", kind: "failure" },
  { slug: "transmission/speed-sensors", system: "Transmission", name: "Speed sensors", kind: "failure" },
  { slug: "transmission/drive-axles", system: "Transmission", name: "Drive axles and joints", kind: "failure" },
  { slug: "transmission/clutch", system: "Transmission", name: "Clutch friction disc and pressure plate", kind: "wear" },
  { slug: "brakes/front-pads", system: "Brakes", name: "Front pads", kind: "wear" },
  { slug: "brakes/discs", system: "Brakes", name: "Discs", kind: "wear" },
  { slug: "brakes/rear-brakes", system: "Brakes", name: "Rear pads and shoes", kind: "wear" },
  { slug: "brakes/calipers", system: "Brakes", name: "Calipers", kind: "failure" },
  { slug: "brakes/brake-fluid", system: "Brakes", name: "Brake fluid", kind: "service" },
  { slug: "brakes/wheel-speed-sensors", system: "Brakes", name: "Wheel speed sensors", kind: "failure" },
  { slug: "steering/assist-sensor", system: "Steering", name: "Steering assist sensor", kind: "failure" },
  { slug: "steering/assist-module", system: "Steering", name: "Steering assist control module", kind: "failure" },
  { slug: "steering/tie-rod-ends", system: "Steering", name: "Tie-rod ends", kind: "failure" },
  { slug: "steering/pump-and-hoses", system: "Steering", name: "Steering pump and hoses", kind: "failure" },
  { slug: "suspension/struts", system: "Suspension", name: "Struts and dampers", kind: "failure" },
  { slug: "suspension/anti-roll-links", system: "Suspension", name: "Anti-roll bar links", kind: "failure" },
  { slug: "suspension/control-arms", system: "Suspension", name: "Control arms and bushes", kind: "failure" },
  { slug: "suspension/wheel-bearings", system: "Suspension", name: "Wheel bearings", kind: "failure" },
  { slug: "tyres-wheels/tyres", system: "Tyres and wheels", name: "Tyres", kind: "wear" },
  { slug: "tyres-wheels/rotation", system: "Tyres and wheels", name: "Tyre rotation and balance", kind: "service" },
  { slug: "tyres-wheels/alignment", system: "Tyres and wheels", name: "Wheel alignment", kind: "service" },
  { slug: "exhaust/catalyst", system: "Exhaust and emissions", name: "Catalytic converter", kind: "failure" },
  { slug: "exhaust/flex-pipe", system: "Exhaust and emissions", name: "Flexible pipe", kind: "failure" },
  { slug: "exhaust/silencer", system: "Exhaust and emissions", name: "Silencer and hangers", kind: "failure" },
  { slug: "hvac/compressor", system: "Heating and air-con", name: "Air-con compressor", kind: "failure" },
  { slug: "hvac/blower", system: "Heating and air-con", name: "Blower motor and resistor", kind: "failure" },
  { slug: "hvac/cabin-filter", system: "Heating and air-con", name: "Cabin air filter", kind: "service" },
  { slug: "body-electrical/exterior-lamps", system: "Body electrical", name: "Exterior lamps", kind: "failure" },
  { slug: "body-electrical/wipers", system: "Body electrical", name: "Wiper blades", kind: "wear" },
  { slug: "body-electrical/wiper-motor", system: "Body electrical", name: "Wiper motor and linkage", kind: "failure" },
  { slug: "body-electrical/door-locks", system: "Body electrical", name: "Door lock actuators", kind: "failure" },
  { slug: "body-electrical/windows", system: "Body electrical", name: "Window regulators", kind: "failure" },
  { slug: "network/data-bus", system: "Vehicle network", name: "Data bus wiring and connectors", kind: "failure" },
  { slug: "restraints/airbag-system", system: "Restraints", name: "Airbag modules and sensors", kind: "failure" },
  { slug: "restraints/clock-spring", system: "Restraints", name: "Steering-wheel clock spring", kind: "failure" },
  { slug: "inspection/scheduled-inspection", system: "Inspection", name: "Scheduled inspection", kind: "service" },
] as const satisfies readonly { slug: string; system: string; name: string; kind: ComponentKind }[];

export type ComponentSlug = (typeof COMPONENTS)[number]["slug"];

export type DtcReference = { code: string; description: string; componentSlug?: ComponentSlug };

/**
 * Generic SAE J2012 codes Recurra knows out of the box. The descriptions are Recurra's own
 * plain words (the official list is copyrighted); data is keyed on the code, never on this text.
 * componentSlug names the component most often behind the code, where one stands out.
 */
// prettier-ignore
export const DTC_REFERENCE: readonly DtcReference[] = [
  { code: "P0087", description: "Fuel rail pressure is lower than the engine computer expects", componentSlug: "fuel-delivery/fuel-pump" },
  { code: "P0101", description: "Air flow sensor reading does not agree with engine load", componentSlug: "engine-management/air-flow-sensor" },
  { code: "P0128", description: "Engine warms up too slowly; coolant stays below the thermostat's opening temperature", componentSlug: "cooling/thermostat" },
  { code: "P0135", description: "Heater circuit fault on the upstream oxygen sensor, bank 1", componentSlug: "engine-management/oxygen-sensors" },
  { code: "P0171", description: "Mixture running lean on bank 1; fuel trim has reached its rich limit" },
  { code: "P0217", description: "Engine has run hotter than its safe coolant temperature" },
  { code: "P0300", description: "Misfires seen on several cylinders, or not tied to one cylinder" },
  { code: "P0301", description: "Misfire seen on cylinder 1" },
  { code: "P0302", description: "Misfire seen on cylinder 2" },
  { code: "P0303", description: "Misfire seen on cylinder 3" },
  { code: "P0304", description: "Misfire seen on cylinder 4" },
  { code: "P0335", description: "Fault in the crankshaft position sensor circuit", componentSlug: "ignition/crank-sensor" },
  { code: "P0420", description: "Catalytic converter on bank 1 is working below its threshold", componentSlug: "exhaust/catalyst" },
  { code: "P0441", description: "Purge flow does not match what the engine computer commanded", componentSlug: "fuel-vapour/purge-valve" },
  { code: "P0442", description: "Small leak found in the fuel vapour system", componentSlug: "fuel-vapour/canister" },
  { code: "P0443", description: "Fault in the purge valve control circuit", componentSlug: "fuel-vapour/purge-valve" },
  { code: "P0446", description: "Fault in the canister vent valve control circuit", componentSlug: "fuel-vapour/vent-valve" },
  { code: "P0455", description: "Large leak found in the fuel vapour system", componentSlug: "fuel-vapour/canister" },
  { code: "P0456", description: "Very small leak found in the fuel vapour system", componentSlug: "fuel-vapour/canister" },
  { code: "P0457", description: "Vapour leak traced to a loose or missing filler cap", componentSlug: "fuel-vapour/filler-cap" },
  { code: "P0496", description: "Purge flow seen while the purge valve should be shut", componentSlug: "fuel-vapour/purge-valve" },
  { code: "P0506", description: "Engine idles slower than its target speed", componentSlug: "engine-management/throttle-body" },
  { code: "P0507", description: "Engine idles faster than its target speed", componentSlug: "engine-management/throttle-body" },
  { code: "P0550", description: "Fault in the power-steering pressure sensor circuit", componentSlug: "steering/assist-sensor" },
  { code: "P0562", description: "Supply voltage has dropped below its normal range" },
  { code: "P0563", description: "Supply voltage has risen above its normal range", componentSlug: "starting-charging/alternator" },
  { code: "P0620", description: "Fault in the alternator control circuit", componentSlug: "starting-charging/alternator" },
  { code: "P0700", description: "Transmission computer has asked for the warning lamp; read its own codes" },
  { code: "P0715", description: "Fault in the transmission input speed sensor circuit", componentSlug: "transmission/speed-sensors" },
  { code: "P0730", description: "Gear ratio measured does not match the gear selected" },
  { code: "P0750", description: "Fault in shift solenoid A", componentSlug: "transmission/shift-solenoids" },
  { code: "P2135", description: "Throttle position sensors A and B disagree", componentSlug: "engine-management/throttle-body" },
  { code: "P2187", description: "Mixture running lean at idle on bank 1" },
  { code: "C0035", description: "Fault in the left front wheel speed sensor circuit", componentSlug: "brakes/wheel-speed-sensors" },
  { code: "C0040", description: "Fault in the right front wheel speed sensor circuit", componentSlug: "brakes/wheel-speed-sensors" },
  { code: "B0001", description: "Fault in the driver front airbag first-stage firing circuit", componentSlug: "restraints/airbag-system" },
  { code: "U0100", description: "No messages received from the engine control module", componentSlug: "network/data-bus" },
  { code: "U0121", description: "No messages received from the anti-lock brake module", componentSlug: "network/data-bus" },
  { code: "U0131", description: "No messages received from the power-steering control module", componentSlug: "steering/assist-module" },
  { code: "U0140", description: "No messages received from the body control module", componentSlug: "network/data-bus" },
];

/**
 * Upserts the component list and the DTC reference (by slug and by code), so it can run at
 * every start and after every release without duplicating rows. Three statements in all.
 */
export async function loadReferenceData(
  db: DbOrTx,
): Promise<{ components: number; dtcCodes: number }> {
  await db
    .insert(components)
    .values(COMPONENTS.map((c) => ({ slug: c.slug, system: c.system, name: c.name, kind: c.kind })))
    .onConflictDoUpdate({
      target: components.slug,
      set: { system: sql`excluded.system`, name: sql`excluded.name`, kind: sql`excluded.kind` },
    });
  const ids = await listComponentIds(db);
  const rows = DTC_REFERENCE.map((d) => {
    const info = parseDtc(d.code);
    if (!info) throw new Error(`loadReferenceData: ${d.code} is not a DTC`);
    return {
      code: info.code,
      description: d.description,
      area: info.area,
      isGeneric: info.control === "generic",
      componentId: d.componentSlug ? (ids.get(d.componentSlug) ?? null) : null,
    };
  });
  await db
    .insert(dtcCodes)
    .values(rows)
    .onConflictDoUpdate({
      target: dtcCodes.code,
      set: {
        description: sql`excluded.description`,
        area: sql`excluded.area`,
        isGeneric: sql`excluded.is_generic`,
        componentId: sql`excluded.component_id`,
      },
    });
  return { components: COMPONENTS.length, dtcCodes: rows.length };
}

/** Component id by slug, for code that writes rows referring to components. */
export async function listComponentIds(db: DbOrTx): Promise<Map<string, number>> {
  const rows = await db.select({ id: components.id, slug: components.slug }).from(components);
  return new Map(rows.map((r) => [r.slug, r.id]));
}
