import { b, doc, type GuideSample, i, ol, p, ul } from "../lib";

export default {
  slug: "kestrel-hood-auxiliary-lamps",
  title: "Hood-hinge auxiliary lamps on a fused relay harness (Calder Kestrel K2)",
  summary:
    "Mount a pair of auxiliary lamps on brackets at the Kestrel K2's hood hinges and feed them through a 20 A fused, relay-switched 12 AWG harness with a dash switch.",
  category: "lighting",
  difficulty: 3,
  minutes: 180,
  author: "author@torqueleaf.test",
  state: "published",
  changeSummary:
    "First published revision: the fuse holder on the battery-tray stud (150 mm from the terminal) and the diesel fitment note.",
  steps: [
    {
      title: "Plan the layout before you touch a tool",
      body: doc(
        p(
          "Lay the kit out on a clean bench and check it against the parts list. The harness in this guide is built around one idea: ",
          b("the dash switch only ever carries the relay's coil current"),
          ", while the lamp current runs through a short, fused path from the battery to the relay and on to the lamps.",
        ),
        ul(
          "Park on level ground, engine off, key out and parking brake on. Let the engine bay cool for at least 30 minutes: the exhaust manifold sits close to the left inner fender.",
          "Open the hood and decide where the relay goes. On the K2 the flat area of the left inner fender, just behind the battery tray, keeps the fused lead short and stays clear of the air box.",
          "Find the body ground stud at each rear corner of the engine bay (an M6 stud on the cowl panel). The lamps use it as their return path.",
          "Pick a blank switch position in the lower dash panel left of the steering column.",
        ),
        p(
          "Every circuit in this guide is sized for the lamps in the parts list (85 W each, 170 W together). If you use other lamps, enter their wattage in the circuit planner and re-check the fuse and wire before you buy anything.",
        ),
      ),
      liftsVehicle: false,
      disconnectsBattery: false,
      photos: [
        {
          file: "wiring-overview.svg",
          alt: "Diagram of battery, inline fuse, relay, dash switch and two lamps connected by wires",
          caption: "The whole harness: battery, fuse, relay near the battery, switch in the cabin, two lamps at the hood hinges.",
        },
      ],
      callouts: [
        {
          kind: "tip",
          text: "Photograph the engine bay before you start. It makes it easy to put every clip and cover back where it was.",
        },
      ],
    },
    {
      title: "Disconnect the battery",
      body: doc(
        p(
          "Open the battery cover and loosen the ",
          b("negative (−)"),
          " terminal nut first, lift the clamp off the post and tuck it aside in a dry cloth or terminal boot so it cannot spring back against the post.",
        ),
        ol(
          "Switch off every load and close the doors with the windows up; some trucks lock themselves when power returns.",
          "Loosen the negative clamp nut (10 mm on the K2) and remove the clamp.",
          "Wait the time the vehicle maker gives before working near any airbag or control-module wiring.",
          "Leave the positive terminal connected but keep its cover closed while you work.",
        ),
        p(
          "With the negative lead off, a slipped spanner on the positive post can no longer short to the body. Note your radio presets: they may reset.",
        ),
      ),
      liftsVehicle: false,
      disconnectsBattery: true,
      photos: [
        {
          file: "battery-terminal-disconnect.svg",
          alt: "A spanner on the negative terminal nut of a 12 V battery with the clamp lifted off",
          caption: "Negative off first, and kept well away from the post.",
        },
      ],
      callouts: [
        {
          kind: "caution",
          signalWord: "WARNING",
          text: "A 12 V battery can deliver hundreds of amps into a short circuit: enough to melt a tool, burn skin and ignite wiring. Disconnect the negative terminal before any wiring work, remove rings and watches, and follow the vehicle maker's instructions and local codes.",
        },
      ],
    },
    {
      title: "Fit the lamp brackets at the hood hinges",
      body: doc(
        p(
          "Each bracket sits between the hood hinge and the fender flange and shares the hinge's two rear mounting bolts. Work ",
          b("one side at a time and one bolt at a time"),
          " so the hood never loses its alignment.",
        ),
        ol(
          "With the hood propped fully open, trace around the hinge base with a paint pen so you can find its exact position again.",
          "Remove the rear hinge-to-fender bolt only. Slide the bracket's slotted foot under the hinge, line the slot up with the bolt hole and refit the bolt finger-tight.",
          "Remove the front bolt, swing the bracket into its final position, refit that bolt with the longer bolt from the kit if the bracket adds thickness, and check the hinge is still on your paint line.",
          "Torque both bolts, then close the hood slowly and check the gap to the fenders. Repeat on the other side.",
        ),
        p(i("If the hood gap changes, loosen both bolts, tap the hinge back to your line and torque again.")),
      ),
      liftsVehicle: false,
      disconnectsBattery: false,
      photos: [
        {
          file: "lamp-bracket-hood-hinge.svg",
          alt: "A lamp bracket clamped under a hood hinge at the rear corner of a pickup's hood, with a round lamp on top",
          caption: "The bracket shares the two rear hinge bolts; the lamp sits just ahead of the windscreen pillar.",
        },
      ],
      callouts: [
        {
          kind: "caution",
          signalWord: "CAUTION",
          text: "Never remove both hinge bolts on one side while the hood is open: the hood can drop or twist and trap your hands. Have a helper hold the hood when you move the bracket.",
        },
        {
          kind: "torque",
          fastener: "Hood hinge bolt through the lamp bracket",
          valueSource: "accessory-maker",
          value: 24,
          unit: "N·m",
          size: "M8",
          propertyClass: "8.8",
        },
        {
          kind: "tip",
          text: "These values are for the brackets in this kit on a dry thread. Where the vehicle maker publishes a value for the hinge bolts, the maker's value governs.",
        },
      ],
    },
    {
      title: "Mount the lamps and set a rough aim",
      body: doc(
        p(
          "Bolt each lamp to its bracket with the stainless pivot bolt, a flat washer on each side of the bracket and the nyloc nut. Point the lamps straight ahead and slightly down; final aiming comes at the end.",
        ),
        ul(
          "Put the lamp's cable outlet facing down so water drains away from the gland.",
          "Check the hood opens fully without the lamp touching the windscreen pillar or the wiper arm.",
          "Leave the lamp cable loose for now; it joins the harness in step 6.",
        ),
      ),
      liftsVehicle: false,
      disconnectsBattery: false,
      photos: [
        {
          file: "lamp-bracket-hood-hinge.svg",
          alt: "Round auxiliary lamp on an angled bracket at a pickup's hood hinge",
          caption: "Cable outlet down, lamp pointing slightly below horizontal.",
        },
      ],
      callouts: [
        {
          kind: "torque",
          fastener: "Lamp pivot bolt (nyloc nut)",
          valueSource: "accessory-maker",
          value: 18,
          unit: "N·m",
          size: "M8",
        },
      ],
    },
    {
      title: "Mount the fuse holder and relay next to the battery",
      body: doc(
        p(
          "The fuse protects the wire, so it goes as close to the battery as you can get it: ",
          b("within 178 mm (7 in) of the positive terminal"),
          ". On the K2 the M6 stud on the front edge of the battery tray puts the holder 150 mm away.",
        ),
        ol(
          "Mount the weatherproof blade fuse holder on the battery-tray stud. Leave the fuse out until the end.",
          "Crimp a ring terminal on the holder's short battery lead; it goes on the positive clamp's accessory stud, not under the clamp nut.",
          "Screw the relay socket to the inner fender with the terminals pointing down so water cannot collect in it.",
          "Connect the relay as below, crimping with the ratchet crimper and sealing each joint with adhesive-lined heat shrink.",
        ),
        ul(
          [b("30"), " – fused battery supply (12 AWG from the fuse holder)"],
          [b("87"), " – lamp feed out (12 AWG to the lamps)"],
          [b("86"), " – coil feed from the dash switch (18 AWG)"],
          [b("85"), " – coil ground (18 AWG to the body ground stud)"],
        ),
        p(
          "The numbers follow DIN 72552 and are moulded next to each blade. Check the relay's own diagram: a few relays swap 85 and 86, which matters if the relay has a diode inside.",
        ),
      ),
      liftsVehicle: false,
      disconnectsBattery: false,
      photos: [
        {
          file: "fuse-holder-battery.svg",
          alt: "Inline blade fuse holder mounted on a stud a short distance from the battery's positive terminal",
          caption: "Fuse holder on the tray stud, 150 mm of wire from the positive terminal.",
        },
        {
          file: "relay-terminals.svg",
          alt: "Automotive relay seen from below with terminals 30, 87, 85 and 86",
          caption: "DIN 72552 terminals: 30 supply, 87 load, 85 and 86 the coil.",
        },
      ],
      callouts: [
        {
          kind: "caution",
          signalWord: "WARNING",
          text: "Fit the fuse before any length of unprotected wire, and never fit a fuse larger than the one shown: a fuse bigger than the wire can carry lets a short circuit overheat the wire and start a fire.",
        },
        {
          kind: "circuit",
          label: "Auxiliary lamp feed (pair, 170 W)",
          systemVoltage: 12,
          loadWatts: 170,
          continuous: true,
          oneWayLengthM: 2.6,
          returnPath: "chassis",
          location: "engine-bay",
          insulationC: 105,
          bundled: 1,
          dropLimitPct: 3,
          wire: { awg: 12 },
          fuseA: 20,
          fuseDistanceMm: 150,
          switchRatingA: 10,
          relay: true,
          feed: "battery",
          // Step 7: the switch and coil take their own 3 A fused tap in the cabin fuse box, on 18 AWG.
          switchFeed: { from: "tap", fuseA: 3, wire: { awg: 18 } },
        },
      ],
    },
    {
      title: "Route the lamp harness and ground the lamps",
      body: doc(
        p(
          "Run the 12 AWG lamp feed from relay terminal 87 along the top of the inner fender, inside split loom, to each hood corner. The return is through the body: each lamp's ground lead goes to the body ground stud at its own cowl corner.",
        ),
        ul(
          "Follow the factory harness where you can and fix the loom with ties every 150–200 mm.",
          "Stay at least 150 mm from the exhaust manifold and turbo heat shield, and clear of the steering shaft, fan and drive belt.",
          "At each hinge leave a gentle service loop so the wire flexes over its length when the hood opens, instead of at one point.",
          "Scrape the paint from under the ground ring terminal, fit a serrated washer and coat the joint with a little dielectric grease.",
          "Join the lamp leads with sealed butt connectors and fit a drip loop below each joint.",
        ),
      ),
      liftsVehicle: false,
      disconnectsBattery: false,
      photos: [
        {
          file: "wire-loom-route.svg",
          alt: "Wire in split loom tied along an inner fender, clear of the exhaust manifold",
          caption: "Loom tied every 150–200 mm along the fender top, well away from heat.",
        },
      ],
      callouts: [
        {
          kind: "caution",
          signalWord: "CAUTION",
          text: "Keep the harness away from hot and moving parts. Check it at both hood positions: a wire pinched by the hinge will chafe through and short.",
        },
      ],
    },
    {
      title: "Bring the switch wire through the firewall and wire the switch",
      body: doc(
        p(
          "Only one thin wire needs to enter the cabin: the 18 AWG lead from the switch to relay terminal 86. Use the large factory grommet low on the driver's side of the firewall.",
        ),
        ol(
          "Pierce the grommet's spare nipple with an awl (never drill a bare hole in the firewall), push the wire through and seal it with a dab of neutral-cure silicone.",
          "Mount the illuminated switch in the dash blank.",
          "Feed the switch from an ignition-switched circuit in the cabin fuse box with a piggyback fuse tap and a 3 A fuse, so the lamps cannot be left on with the truck parked.",
          "Ground the switch illumination to the body bolt next to the fuse box.",
        ),
      ),
      liftsVehicle: false,
      disconnectsBattery: false,
      photos: [
        {
          file: "firewall-grommet.svg",
          alt: "A single wire passing through a rubber grommet in a steel firewall",
          caption: "Through the spare nipple of the factory grommet, sealed afterwards.",
        },
        {
          file: "fuse-tap.svg",
          alt: "An piggyback fuse tap holding two blade fuses plugged into a fuse box slot",
          caption: "Piggyback fuse tap: the original fuse below, the new 3 A fuse above.",
        },
      ],
      callouts: [
        {
          kind: "circuit",
          label: "Switch and relay coil feed",
          systemVoltage: 12,
          loadAmps: 0.3,
          continuous: true,
          oneWayLengthM: 1.5,
          returnPath: "chassis",
          location: "cabin",
          insulationC: 105,
          bundled: 1,
          dropLimitPct: 10,
          wire: { awg: 18 },
          fuseA: 3,
          switchRatingA: 10,
          relay: false,
          feed: "fuse-box",
        },
        {
          kind: "tip",
          text: "Put the tap on a non-safety circuit such as the accessory socket, never on the airbag, brake or engine-management fuses.",
        },
      ],
    },
    {
      title: "Reconnect, test and aim",
      body: doc(
        ol(
          "Fit the 20 A fuse in the holder by the battery.",
          "Refit the negative clamp and torque its nut.",
          "Turn the ignition on and the switch on: both lamps should light and the switch should glow. Ignition off: the lamps must go out.",
          "Park 7.5 m from a wall on level ground. Aim the lamps so their brightest spot sits just below the height of the lamp centres, then torque the pivot bolts again.",
        ),
        p(
          "Auxiliary driving lamps are regulated differently from place to place. Check the rules where you drive, and fit the covers on public roads if they require it.",
        ),
      ),
      liftsVehicle: false,
      disconnectsBattery: false,
      photos: [
        {
          file: "lamp-aim-wall.svg",
          alt: "A pickup facing a wall with two light spots aimed slightly below the lamp height",
          caption: "Aim at a wall 7.5 m away, hot spots just below lamp height.",
        },
      ],
      callouts: [
        {
          kind: "caution",
          signalWord: "NOTICE",
          text: "Off-road lamps aimed too high dazzle other drivers. Follow local lighting regulations and the vehicle maker's instructions; the torque values in this guide are for this kit, and the maker's values govern where they exist.",
        },
        { kind: "torque", fastener: "Battery negative terminal clamp nut", valueSource: "vehicle-maker", value: 6, unit: "N·m" },
      ],
    },
  ],
  fitment: [
    { variant: "kestrel-k2-gas-rwd", status: "fits" },
    { variant: "kestrel-k2-gas-4wd", status: "fits" },
    {
      variant: "kestrel-k2-diesel-4wd",
      status: "fits-with-changes",
      note: "The diesel's battery tray has its spare stud on the inboard side: mount the fuse holder there (still under 178 mm) and add 0.3 m to the far lamp's feed. The 12 AWG wire and 20 A fuse still stay under 2 % drop.",
    },
    {
      variant: "kestrel-k3-gas-4wd",
      status: "does-not-fit",
      note: "The K3 hood hinges use a three-bolt base; these brackets do not line up.",
    },
  ],
  parts: [
    { name: "Auxiliary driving lamp, 85 W, 12 V", quantity: 2, partNumber: "HL-85R-12", step: 3 },
    {
      name: "Hood-hinge lamp bracket pair with longer M8 hinge bolts",
      quantity: 1,
      partNumber: "KB-K2-HH02",
      notes: "Left and right are handed.",
      step: 2,
    },
    { name: "Weatherproof blade fuse holder, 12 AWG leads", quantity: 1, partNumber: "FH-12W", step: 4 },
    { name: "Blade fuse, 20 A", quantity: 2, notes: "One fitted, one spare in the glovebox.", step: 4 },
    { name: "Automotive relay, 12 V 30/40 A, with sealed socket", quantity: 1, partNumber: "RL-40S", step: 4 },
    { name: "Wire, 12 AWG, 105 °C, red", quantity: 5, notes: "Metres.", step: 5 },
    { name: "Wire, 12 AWG, 105 °C, black", quantity: 2, notes: "Metres, for the two ground leads.", step: 5 },
    { name: "Wire, 18 AWG, 105 °C", quantity: 4, notes: "Metres, switch and coil.", step: 6 },
    { name: "Split loom, 10 mm", quantity: 5, notes: "Metres.", step: 5 },
    { name: "Illuminated rocker switch, 12 V", quantity: 1, partNumber: "SW-RK12", step: 6 },
    { name: "Piggyback fuse tap (mini blade)", quantity: 1, partNumber: "FT-MINI", step: 6 },
    { name: "Blade fuse, 3 A (mini)", quantity: 1, step: 6 },
    { name: "Adhesive-lined heat shrink and ring terminals assortment", quantity: 1, step: 4 },
  ],
  tools: [
    { name: "Torque wrench, 5–60 N·m" },
    { name: "10 mm and 13 mm sockets" },
    { name: "Ratchet crimper for insulated terminals" },
    { name: "Wire stripper" },
    { name: "Heat gun" },
    { name: "Multimeter" },
    { name: "Paint pen" },
    { name: "Awl" },
  ],
} satisfies GuideSample;
