import { b, doc, type GuideSample, i, ol, p, ul } from "../lib";

export default {
  slug: "kestrel-rear-recovery-points",
  title: "Rated rear recovery points on the frame (Calder Kestrel K2)",
  summary:
    "Bolt a pair of rated recovery brackets to the factory threaded holes at the rear of the Kestrel K2's frame rails, torque them correctly and learn how to use them safely.",
  category: "recovery",
  difficulty: 3,
  minutes: 90,
  author: "author2@torqueleaf.test",
  state: "published",
  changeSummary: "Added the K3 fitment notes and the inspection checklist before every recovery.",
  steps: [
    {
      title: "Know what a rated recovery point is",
      body: doc(
        p(
          "A recovery point is a bracket with a published working load limit (WLL), bolted to the frame, built to take a snatch strap's peak load. A tow ball, a tie-down loop or a bumper bracket is ",
          b("not"),
          " a recovery point.",
        ),
        ul(
          "The brackets in this kit are rated 4.75 t WLL each and take a 3/4 in bow shackle or a soft shackle.",
          "Both brackets bolt through existing threaded holes in the frame: no drilling or welding.",
          "Use both points with a bridle for heavy pulls so the load is shared between the rails.",
        ),
      ),
      liftsVehicle: false,
      disconnectsBattery: false,
      photos: [
        {
          file: "shackle-recovery-point.svg",
          alt: "A bow shackle through the eye of a steel recovery bracket on a frame rail",
          caption: "A rated bracket and a rated shackle: the only acceptable attachment.",
        },
      ],
      callouts: [
        {
          kind: "caution",
          signalWord: "WARNING",
          text: "Recovery straps and ropes store a great deal of energy. If a point, shackle or tow ball fails, parts can be thrown with lethal force. Use only rated points and shackles, never a tow ball, and keep everyone well clear of the line during a recovery.",
        },
      ],
    },
    {
      title: "Lower the spare wheel for access",
      body: doc(
        ol(
          "Open the access plug below the tailgate and fit the jack handle extension into the spare-wheel winch.",
          "Turn anticlockwise until the wheel sits on the ground, then unhook it and slide it out.",
          "Wind the cable back up so it does not hang in your way.",
        ),
        p(i("The truck stays on its wheels for this job: there is room to work at the rear of the frame without lifting it.")),
      ),
      liftsVehicle: false,
      disconnectsBattery: false,
      photos: [],
      callouts: [],
    },
    {
      title: "Clean and inspect the threaded holes",
      body: doc(
        p(
          "Each rear frame rail has two M12 threaded holes on its outside face, between the rear spring hanger and the bumper mount. They are often full of road dirt.",
        ),
        ol(
          "Wire-brush the frame around the holes back to sound metal.",
          "Run an M12 × 1.5 thread chaser through each hole. Do not use a cutting tap: it removes metal and weakens the thread.",
          "Blow out the holes and clean them with brake cleaner.",
          "Look for cracks, heavy rust or previous repairs. If you find any, stop and have the frame checked before you fit recovery points.",
        ),
      ),
      liftsVehicle: false,
      disconnectsBattery: false,
      photos: [
        {
          file: "recovery-bracket-frame.svg",
          alt: "Outside face of a pickup's rear frame rail with two threaded holes and a bracket ready to fit",
          caption: "Two M12 holes on the outside of each rear rail.",
        },
      ],
      callouts: [
        {
          kind: "caution",
          signalWord: "CAUTION",
          text: "Wear safety glasses when wire-brushing under the truck; loose rust falls straight down.",
        },
        {
          kind: "caution",
          signalWord: "WARNING",
          text: "On the electric K3, orange cables of the high-voltage system run inside the left rear frame rail. Do not drill, pry or wire-brush near them, and follow the vehicle maker's instructions for work near the high-voltage system.",
        },
      ],
    },
    {
      title: "Fit the brackets",
      body: doc(
        ol(
          "Put a hardened washer under each bolt head and a drop of medium-strength threadlocker on the threads.",
          "Hold the bracket with its eye pointing down and rearwards and start both bolts by hand for at least three turns.",
          "Run both bolts down until the bracket sits flat against the frame with no gap.",
        ),
        p("Use only the new class 10.9 bolts from the kit; do not reuse old bolts."),
      ),
      liftsVehicle: false,
      disconnectsBattery: false,
      photos: [
        {
          file: "recovery-bracket-frame.svg",
          alt: "Recovery bracket held against a frame rail with two bolts started",
          caption: "Bracket flat against the rail, both bolts started by hand.",
        },
      ],
      callouts: [],
    },
    {
      title: "Torque the bolts",
      body: doc(
        p(
          "Torque both bolts in two passes: first to about half the value, then to the full value. Mark each bolt head and the bracket with a paint pen so you can see at a glance if one has turned.",
        ),
      ),
      liftsVehicle: false,
      disconnectsBattery: false,
      photos: [
        {
          file: "torque-wrench-bolt.svg",
          alt: "A torque wrench on a recovery bracket bolt",
          caption: "Two passes, then a paint mark across bolt and bracket.",
        },
      ],
      callouts: [
        {
          kind: "caution",
          signalWord: "NOTICE",
          text: "This value is the bracket maker's for this kit. Where the vehicle maker specifies a torque for these frame holes, the maker's value governs. Replace any bolt that has been over-tightened.",
        },
        {
          kind: "torque",
          fastener: "Recovery bracket to frame rail",
          valueSource: "accessory-maker",
          value: 105,
          unit: "N·m",
          size: "M12",
          propertyClass: "10.9",
          threadlocker: "medium-strength, removable",
        },
      ],
    },
    {
      title: "Refit the spare and check clearances",
      body: doc(
        ul(
          "Raise the spare wheel back into place and check it does not touch the brackets.",
          "Check the exhaust tailpipe is at least 25 mm from the left bracket, and the trailer wiring is not trapped.",
          "Touch up bare metal on the frame with primer and paint.",
        ),
      ),
      liftsVehicle: false,
      disconnectsBattery: false,
      photos: [],
      callouts: [],
    },
    {
      title: "Inspect before every recovery",
      body: doc(
        ol(
          "Check the paint marks: if a bolt has turned, re-torque it before use.",
          "Look for cracks around the eye and the bolts.",
          "Tighten the shackle pin fully by hand, then back it off a quarter turn so it does not seize under load.",
          "Put a line damper or a heavy jacket over the middle of the strap.",
          "Keep bystanders at least one and a half times the strap's length away from the line, and out of its line of travel.",
        ),
      ),
      liftsVehicle: false,
      disconnectsBattery: false,
      photos: [
        {
          file: "shackle-recovery-point.svg",
          alt: "A shackle pin being tightened in a recovery bracket",
          caption: "Pin in hand-tight, then back a quarter turn.",
        },
      ],
      callouts: [
        {
          kind: "tip",
          text: "Soft shackles are lighter and less dangerous if something fails, but keep them away from sharp edges.",
        },
      ],
    },
  ],
  fitment: [
    { variant: "kestrel-k2-gas-rwd", status: "fits" },
    { variant: "kestrel-k2-gas-4wd", status: "fits" },
    { variant: "kestrel-k2-diesel-4wd", status: "fits" },
    {
      variant: "kestrel-k3-gas-4wd",
      status: "fits-with-changes",
      note: "The K3 frame's holes are 20 mm further apart: use the K3 adapter plate (AP-K3) between bracket and rail, with the longer bolts it includes.",
    },
    {
      variant: "kestrel-k3-electric-4wd",
      status: "fits-with-changes",
      note: "Use the K3 adapter plate as for the gas K3. The orange high-voltage cables to the rear drive unit run inside the left rail: do not drill, and keep tools away from them.",
    },
  ],
  parts: [
    { name: "Rated recovery bracket, 4.75 t WLL", quantity: 2, partNumber: "RP-K2-475", step: 3 },
    { name: "Bolt M12 × 1.5 × 35, class 10.9", quantity: 4, step: 3 },
    { name: "Hardened washer, M12", quantity: 4, step: 3 },
    { name: "Medium-strength threadlocker", quantity: 1, step: 3 },
    { name: "Bow shackle, 3/4 in, rated 4.75 t", quantity: 2, partNumber: "SH-34R", step: 6 },
  ],
  tools: [
    { name: "Torque wrench, 40–200 N·m" },
    { name: "18 mm socket" },
    { name: "M12 × 1.5 thread chaser" },
    { name: "Wire brush" },
    { name: "Paint pen" },
    { name: "Safety glasses" },
  ],
} satisfies GuideSample;
