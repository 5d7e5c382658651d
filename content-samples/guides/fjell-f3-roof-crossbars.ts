import { b, doc, type GuideSample, i, ol, p, ul } from "../lib";

export default {
  slug: "fjell-f3-roof-crossbars",
  title: "Roof crossbars on the flush rails (Norvik Fjell F3)",
  summary:
    "Fit a pair of clamp-on aluminium crossbars to the Fjell F3's flush roof rails at the right spacing and torque, and re-check them after the first drive.",
  category: "racks",
  difficulty: 2,
  minutes: 60,
  author: "author2@torqueleaf.test",
  state: "published",
  changeSummary: "Added the lbf·in value for the clamp bolts and the re-check after the first 50 km.",
  steps: [
    {
      title: "Check the rails and the roof load limit",
      body: doc(
        p(
          "The F3 has flush rails: a closed profile glued and bolted along each roof edge, with a groove on its inner face for the clamp pads. Run a finger along each rail and check it is firm, clean and undamaged.",
        ),
        ul(
          [
            "Find the roof load limit in the owner's manual. For this demo the F3 lists ",
            b("75 kg"),
            " (60 kg with the panoramic roof), and that figure ",
            i("includes"),
            " the bars and anything mounted on them.",
          ],
          "The bars in this kit weigh 5.4 kg the pair, so 69.6 kg is left for the load on a standard roof.",
          "Work from a sturdy step platform, never from the door sills or tyres.",
        ),
      ),
      liftsVehicle: false,
      disconnectsBattery: false,
      photos: [
        {
          file: "crossbar-on-rails.svg",
          alt: "Side view of a compact SUV roof with two crossbars clamped to flush roof rails",
          caption: "Two bars on the flush rails of the F3.",
        },
      ],
      callouts: [
        {
          kind: "caution",
          signalWord: "CAUTION",
          text: "Overloading the roof changes how the vehicle handles and brakes and can damage the rails. Never exceed the roof load limit in the vehicle maker's manual, including the weight of the bars.",
        },
      ],
    },
    {
      title: "Clean the rails and mark the bar positions",
      body: doc(
        ol(
          "Wash the rails where the pads will sit and dry them; grit under a pad scratches the finish and lets the bar creep.",
          "Measure 180 mm back from the front end of each rail and put a strip of masking tape there: this is the front edge of the front foot.",
          "Measure 750 mm back from that mark for the front edge of the rear foot.",
          "Check the diagonal measurements across the roof match within 5 mm, so the bars are square to the car.",
        ),
      ),
      liftsVehicle: false,
      disconnectsBattery: false,
      photos: [
        {
          file: "roof-rail-measure.svg",
          alt: "A tape measure laid along a roof rail with two tape marks",
          caption: "Front foot 180 mm from the rail end, bar spread 750 mm.",
        },
      ],
      callouts: [
        {
          kind: "tip",
          text: "A wider bar spread carries long loads better, but the kit instructions' spread keeps the bars on the strongest parts of the rail. Do not go beyond 800 mm on the F3.",
        },
      ],
    },
    {
      title: "Assemble the feet and set the bar width",
      body: doc(
        p(
          "Slide a foot onto each end of each bar's lower T-track. The F3 fitting plate (marked F3) goes on the inside of each foot.",
        ),
        ol(
          "Centre the bar: the overhang past each foot should match within 5 mm.",
          "Set the width with the scale on the fitting plate to position 4 for the F3.",
          "Tighten the foot-to-bar bolts to the value below.",
        ),
      ),
      liftsVehicle: false,
      disconnectsBattery: false,
      photos: [
        {
          file: "crossbar-foot.svg",
          alt: "Close-up of a crossbar foot with its clamp pad and fitting plate on the end of a bar",
          caption: "Foot on the bar's T-track with the F3 fitting plate inboard.",
        },
      ],
      callouts: [
        { kind: "torque", fastener: "Foot-to-bar bolt", valueSource: "accessory-maker", value: 6, unit: "N·m", size: "M6" },
      ],
    },
    {
      title: "Place the bars on the rails",
      body: doc(
        ul(
          "With a helper, lift the front bar onto the rails, feet at the tape marks, the bar's profile's thicker edge facing forward.",
          "Check each rubber pad sits flat on top of the rail and each clamp jaw hooks into the rail's inner groove.",
          "Snug the clamp bolts by hand only, then place the rear bar the same way.",
        ),
        p("Measure the spread again at both ends: the bars must be parallel within 5 mm."),
      ),
      liftsVehicle: false,
      disconnectsBattery: false,
      photos: [
        {
          file: "crossbar-on-rails.svg",
          alt: "Two crossbars placed on roof rails, feet aligned with tape marks",
          caption: "Feet on the marks, pads flat on the rails.",
        },
      ],
      callouts: [],
    },
    {
      title: "Tighten the clamps to torque",
      body: doc(
        p(
          "Tighten in steps, ",
          b("alternating left and right"),
          " on the same bar so it stays centred: first to about half the value on all four clamps, then to the full value.",
        ),
        ol(
          "Front bar: left, right, left, right.",
          "Rear bar: the same.",
          "Go round all four clamps once more at the full value; the wrench should click without the bolt turning.",
        ),
        p(
          "Use the torque wrench or the kit's click-limiting key. Do not add force once it clicks: more clamp force does not mean a safer bar, and a crushed rail cannot be repaired.",
        ),
      ),
      liftsVehicle: false,
      disconnectsBattery: false,
      photos: [
        {
          file: "torque-wrench-bolt.svg",
          alt: "A click-type torque wrench on a bolt head",
          caption: "Tighten in two passes, alternating sides.",
        },
      ],
      callouts: [
        {
          kind: "caution",
          signalWord: "NOTICE",
          text: "These values are the bar kit's. Where the vehicle maker gives a value for its rails, the maker's value governs. Over-tightening cracks the clamp or dents the rail.",
        },
        { kind: "torque", fastener: "Crossbar clamp bolt", valueSource: "accessory-maker", value: 7, unit: "N·m", size: "M6" },
        {
          kind: "torque",
          fastener: "Crossbar clamp bolt (same value, inch-pound wrench)",
          valueSource: "accessory-maker",
          value: 62,
          unit: "lbf·in",
          size: "M6",
        },
      ],
    },
    {
      title: "Fit the end caps and locks, then test",
      body: doc(
        ol(
          "Push the lock cores into the foot covers with the change key, fit the covers and lock them.",
          "Trim the T-track cover strip to length and press it into the bar's top slot.",
          "Grip each bar in the middle and push it firmly forwards, backwards and sideways. The car should rock as one piece; the bar must not move on the rail.",
        ),
      ),
      liftsVehicle: false,
      disconnectsBattery: false,
      photos: [
        {
          file: "crossbar-foot.svg",
          alt: "Crossbar foot with its cover closed",
          caption: "Covers on and locked.",
        },
      ],
      callouts: [
        {
          kind: "tip",
          text: "Write the key number down somewhere other than the car. A lost key means drilling the lock cores.",
        },
      ],
    },
    {
      title: "Re-check after the first drive",
      body: doc(
        p(
          "Clamp pads settle in the first few kilometres. After about 50 km, check every clamp bolt again at the same torque, and after that at every fuel stop on a long trip with a load on.",
        ),
        ul(
          "If the bars whistle at speed, check the profile's thicker edge faces forward.",
          "Take the bars off when you will not use them for a while: they cost fuel and add wind noise.",
        ),
      ),
      liftsVehicle: false,
      disconnectsBattery: false,
      photos: [
        {
          file: "torque-wrench-bolt.svg",
          alt: "Torque wrench on a clamp bolt",
          caption: "Same torque again after 50 km.",
        },
      ],
      callouts: [],
    },
  ],
  fitment: [
    { variant: "fjell-f3-gas-fwd", status: "fits" },
    { variant: "fjell-f3-gas-awd", status: "fits" },
    { variant: "fjell-f3-hybrid-awd", status: "fits" },
    {
      variant: "fjell-f3-phev-awd",
      status: "fits-with-changes",
      note: "The plug-in hybrid comes with the panoramic roof as standard: the roof load limit drops to 60 kg including the bars.",
    },
    {
      variant: "fjell-f2-gas-fwd",
      status: "fits-with-changes",
      note: "The F2 has raised rails: use the raised-rail foot kit (RF-200) instead of the flush-rail feet; the bars are the same.",
    },
    {
      variant: "kestrel-k2-gas-4wd",
      status: "does-not-fit",
      note: "No roof rails on the Kestrel; use a bed-mounted rack.",
    },
  ],
  parts: [
    { name: "Aluminium crossbar, 1200 mm", quantity: 2, partNumber: "XB-1200A", step: 2 },
    { name: "Flush-rail foot pack (4 feet)", quantity: 1, partNumber: "FR-400", step: 2 },
    { name: "Fitting plate set F3", quantity: 1, partNumber: "FP-F3", notes: "Marked F3 on the plate.", step: 2 },
    { name: "Lock cores with two keys", quantity: 4, partNumber: "LC-4K", step: 5 },
    { name: "T-track cover strip", quantity: 2, notes: "Usually supplied with the bars.", step: 5 },
  ],
  tools: [
    { name: "Torque wrench, 2–25 N·m (or the kit's click-limiting key)" },
    { name: "Tape measure" },
    { name: "Masking tape" },
    { name: "Step platform" },
    { name: "Clean cloths" },
  ],
} satisfies GuideSample;
