import { b, doc, type GuideSample, i, ol, p, ul } from "../lib";

export default {
  slug: "fjell-hybrid-cargo-12v-outlet",
  title: "12 V outlet in the cargo side panel (Norvik Fjell F3 hybrid)",
  summary:
    "Add a 10 A, 12 V outlet to the left cargo side panel of the Fjell F3 hybrid, fed from the 12 V battery that sits just below it under the cargo floor.",
  category: "power",
  difficulty: 3,
  minutes: 120,
  author: "author2@torqueleaf.test",
  state: "published",
  changeSummary:
    "Added the ignition-triggered relay so the outlet cannot drain the 12 V battery, and fitment notes for the gas and plug-in hybrid variants.",
  steps: [
    {
      title: "Read the high-voltage precautions and plan the job",
      body: doc(
        p(
          "The Fjell F3 hybrid keeps its small 12 V battery in a well under the cargo floor, on the left, with the traction battery pack ahead of it under the rear seat. That is good news for a cargo outlet: the whole circuit is about ",
          b("1.2 m one way"),
          ", against more than 5 m on the gas versions.",
        ),
        ul(
          "You will only work on the 12 V side: the 12 V battery, the trim panels and new wire that you add.",
          "Orange cables and anything with an orange or high-voltage label belong to the traction system. You will not touch, move, tie to or cut anything near them.",
          "The outlet goes in the flat area of the left side panel, above the battery well and below the cargo-cover rail. Check behind the panel first: there must be 70 mm of clear depth.",
        ),
      ),
      liftsVehicle: false,
      disconnectsBattery: false,
      photos: [
        {
          file: "hv-cable-warning.svg",
          alt: "An orange high-voltage cable in a corrugated sleeve next to a warning triangle",
          caption: "Orange cables are the high-voltage system. Leave them alone.",
        },
      ],
      callouts: [
        {
          kind: "caution",
          signalWord: "WARNING",
          text: "This vehicle has a high-voltage system. Orange cables and parts with high-voltage labels can cause severe burns or death: do not touch, pierce, cut or route wires along them. Before you start, switch the vehicle off (not in READY), keep the key fob at least 5 m away and follow the vehicle maker's procedure for working near the high-voltage system. Any work on the high-voltage system itself is for trained, certified technicians only.",
        },
      ],
    },
    {
      title: "Open the cargo floor and remove the left side trim",
      body: doc(
        ol(
          "Lift out the cargo floor board and the foam storage tray below it.",
          "Unscrew the two screws at the bottom of the left side panel and unclip the cargo-cover rail trim.",
          "Pull the side panel away from the body starting at the rear edge, one clip at a time, with a plastic trim tool. Unplug the cargo lamp from the panel's back.",
          "Set the panel face-down on a blanket.",
        ),
        p(
          "You can now see the 12 V battery in its well, with its vent tube leaving the top towards the floor, and the body harness running forward along the wheel arch.",
        ),
      ),
      liftsVehicle: false,
      disconnectsBattery: false,
      photos: [
        {
          file: "cargo-battery-bay.svg",
          alt: "A 12 V battery in a well under a lifted cargo floor, with its vent tube and terminals visible",
          caption: "The F3 hybrid's 12 V battery, under the cargo floor on the left.",
        },
      ],
      callouts: [
        {
          kind: "tip",
          text: "Trim clips often break on removal. Keep a few spares of the square clips used on the side panel before you start.",
        },
      ],
    },
    {
      title: "Disconnect the 12 V battery",
      body: doc(
        p(
          "Make sure the vehicle is off, not just silent: a hybrid in READY makes no noise. Then wait the time the maker gives for the control modules to shut down before you touch the battery.",
        ),
        ol(
          "Loosen the negative (−) clamp nut and lift the clamp off the post.",
          "Fit a terminal boot or wrap the clamp in a dry cloth so it cannot touch the post.",
          "Leave the vent tube connected and in place.",
        ),
        p(i("Disconnecting the 12 V battery does not make the high-voltage system safe. The rules of step 1 still apply.")),
      ),
      liftsVehicle: false,
      disconnectsBattery: true,
      photos: [
        {
          file: "battery-terminal-disconnect.svg",
          alt: "A spanner loosening a 12 V battery's negative terminal clamp",
          caption: "Negative clamp off and insulated.",
        },
      ],
      callouts: [
        {
          kind: "caution",
          signalWord: "CAUTION",
          text: "The cargo-area battery is vented to the outside through its tube. If the tube is left off, gas from charging collects in the cabin. Check it is seated before you refit the floor.",
        },
      ],
    },
    {
      title: "Cut the opening and fit the outlet",
      body: doc(
        ol(
          "Mark the hole centre on the panel's front face, 90 mm above the lower edge and 120 mm from the rear edge.",
          "Drill a 4 mm pilot, then cut a 29 mm hole with a step drill from the front, so the visible edge stays clean.",
          "Deburr the edge and test-fit the socket; the flange must sit flat.",
          "Fit the socket with its retaining collar from behind, hand-tight plus a quarter turn: the panel is plastic.",
        ),
      ),
      liftsVehicle: false,
      disconnectsBattery: false,
      photos: [
        {
          file: "cargo-outlet-panel.svg",
          alt: "A round 12 V outlet with a hinged cap set into a cargo side trim panel",
          caption: "Outlet in the flat area above the battery well.",
        },
      ],
      callouts: [
        {
          kind: "tip",
          text: "A step drill leaves a much cleaner edge in trim plastic than a hole saw. Stop as soon as the 29 mm step breaks through.",
        },
      ],
    },
    {
      title: "Fit the fuse holder and the relay at the battery",
      body: doc(
        p(
          "The outlet is fed straight from the battery through a ",
          b("15 A fuse 120 mm from the positive terminal"),
          ". A relay switches it with the vehicle, so a cool box left plugged in cannot flatten the small 12 V battery: if that battery goes flat, a hybrid will not go to READY.",
        ),
        ol(
          "Mount the fuse holder on the bracket on the battery well's front edge. Crimp its short lead to a ring terminal on the positive clamp's accessory stud. Fuse out for now.",
          "Mount the relay socket above the battery well on the body, terminals down.",
          "Relay 30: fused supply from the holder. Relay 87: 14 AWG feed to the outlet centre pin.",
          "Relay 86: trigger from the switched accessory circuit, taken with a piggyback fuse tap (5 A) in the rear junction block behind the right side panel. Relay 85: to the body ground bolt in the battery well.",
        ),
      ),
      liftsVehicle: false,
      disconnectsBattery: false,
      photos: [
        {
          file: "fuse-holder-battery.svg",
          alt: "Inline fuse holder mounted a hand's width from a battery's positive terminal",
          caption: "Fuse holder 120 mm from the positive terminal.",
        },
        {
          file: "relay-terminals.svg",
          alt: "Relay with terminals 30, 87, 85 and 86",
          caption: "30 from the fuse, 87 to the outlet, 86 trigger, 85 ground.",
        },
      ],
      callouts: [
        {
          kind: "caution",
          signalWord: "WARNING",
          text: "Do not fit a larger fuse because an appliance blows the 15 A one. The fuse protects the 14 AWG wire; a bigger fuse can let the wire overheat and start a fire behind the trim.",
        },
        {
          kind: "circuit",
          label: "Cargo outlet feed (10 A)",
          systemVoltage: 12,
          loadAmps: 10,
          continuous: true,
          oneWayLengthM: 1.2,
          returnPath: "wire",
          location: "cabin",
          insulationC: 105,
          bundled: 2,
          dropLimitPct: 10,
          wire: { awg: 14 },
          fuseA: 15,
          fuseDistanceMm: 120,
          switchRatingA: 10,
          relay: true,
          feed: "battery",
          // The relay trigger comes from a 5 A piggyback fuse tap on 18 AWG, not from the outlet's fused line.
          switchFeed: { from: "tap", fuseA: 5, wire: { awg: 18 } },
        },
      ],
    },
    {
      title: "Run and secure the wiring",
      body: doc(
        ul(
          "Run the red 14 AWG feed from relay 87 to the outlet's centre terminal, and the black 14 AWG return from the outlet's outer terminal back to the battery negative clamp's accessory stud.",
          "Keep both wires together in split loom and tie them to the existing body harness along the wheel arch every 150–200 mm.",
          "Stay clear of the rear-seat folding mechanism and the tailgate strut mount, and keep at least 100 mm from any orange cable or cover.",
          "Use insulated female spade terminals on the outlet and slide the insulating boots fully home.",
        ),
        p(
          "A wire return to the battery is used rather than a chassis ground: the panel area has no good bare-metal stud, and a proper return wire keeps the voltage drop predictable.",
        ),
      ),
      liftsVehicle: false,
      disconnectsBattery: false,
      photos: [
        {
          file: "wire-loom-route.svg",
          alt: "Two wires in split loom tied to an existing harness with cable ties",
          caption: "New pair tied to the body harness every 150–200 mm.",
        },
      ],
      callouts: [],
    },
    {
      title: "Reconnect, test and refit the trim",
      body: doc(
        ol(
          "Fit the 15 A fuse. Refit the negative clamp and torque its nut.",
          "Switch the vehicle to READY. The outlet should read 13.5–14.5 V on a multimeter (the DC-DC converter is charging).",
          "Plug in a known 8–10 A load, such as a cool box or tyre inflator, for ten minutes; the wires and socket should be no more than warm.",
          "Switch the vehicle off: the outlet must go dead within a few seconds.",
          "Refit the side panel, plug the cargo lamp back in, and refit the tray and floor.",
        ),
        p(
          "Some windows and the tailgate may need their auto functions re-learned after a battery disconnect; follow the owner's manual.",
        ),
      ),
      liftsVehicle: false,
      disconnectsBattery: false,
      photos: [
        {
          file: "cargo-outlet-panel.svg",
          alt: "Finished 12 V outlet in a cargo side panel with its cap open",
          caption: "Finished: outlet live only when the vehicle is on.",
        },
      ],
      callouts: [
        {
          kind: "caution",
          signalWord: "NOTICE",
          text: "The torque value is typical for this battery clamp; the vehicle maker's value governs. Follow the maker's instructions and local codes, and have a qualified technician check anything you are unsure of.",
        },
        { kind: "torque", fastener: "12 V battery negative clamp nut", valueSource: "vehicle-maker", value: 5, unit: "N·m" },
      ],
    },
  ],
  fitment: [
    { variant: "fjell-f3-hybrid-awd", status: "fits" },
    {
      variant: "fjell-f3-phev-awd",
      status: "fits-with-changes",
      note: "The 12 V battery is under the rear seat: tilt the seat cushion forward and run about 2.0 m one way to the panel. 14 AWG and the 15 A fuse still give under 3 % drop. The high-voltage precautions apply.",
    },
    {
      variant: "fjell-f3-gas-fwd",
      status: "fits-with-changes",
      note: "Battery in the engine bay: the run is about 5.5 m one way through the firewall grommet and under the left sill trim. Use 12 AWG (about 4.8 % drop at 10 A) with the 15 A fuse at the battery.",
    },
    {
      variant: "fjell-f3-gas-awd",
      status: "fits-with-changes",
      note: "As for the gas FWD: feed from the engine-bay battery, about 5.5 m one way, 12 AWG, 15 A fuse at the battery.",
    },
    {
      variant: "fjell-f2-gas-fwd",
      status: "does-not-fit",
      note: "The F2's left side panel covers the subwoofer enclosure; there is no depth behind it for the socket body.",
    },
  ],
  parts: [
    { name: "12 V outlet with hinged cap and retaining collar, 29 mm", quantity: 1, partNumber: "OS-29C", step: 3 },
    { name: "Weatherproof blade fuse holder, 14 AWG leads", quantity: 1, partNumber: "FH-14W", step: 4 },
    { name: "Blade fuse, 15 A", quantity: 2, notes: "One spare.", step: 4 },
    { name: "Automotive relay, 12 V 30/40 A, with socket", quantity: 1, partNumber: "RL-40S", step: 4 },
    { name: "Piggyback fuse tap (mini blade) with 5 A fuse", quantity: 1, partNumber: "FT-MINI", step: 4 },
    { name: "Wire, 14 AWG, 105 °C, red", quantity: 2, notes: "Metres.", step: 5 },
    { name: "Wire, 14 AWG, 105 °C, black", quantity: 2, notes: "Metres.", step: 5 },
    { name: "Wire, 18 AWG, relay trigger and ground", quantity: 3, notes: "Metres.", step: 4 },
    { name: "Split loom, 7 mm", quantity: 2, notes: "Metres.", step: 5 },
    { name: "Insulated female spade terminals, 6.3 mm", quantity: 2, step: 5 },
    { name: "Trim clips for the cargo side panel", quantity: 4, partNumber: "NV-CLIP-SQ8", step: 1 },
  ],
  tools: [
    { name: "Plastic trim tool set" },
    { name: "Step drill to 30 mm" },
    { name: "10 mm socket and torque wrench (2–25 N·m)" },
    { name: "Ratchet crimper" },
    { name: "Wire stripper" },
    { name: "Multimeter" },
  ],
} satisfies GuideSample;
