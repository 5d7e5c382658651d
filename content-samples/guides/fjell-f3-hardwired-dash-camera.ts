import { b, doc, type GuideSample, i, ol, p, ul } from "../lib";

export default {
  slug: "fjell-f3-hardwired-dash-camera",
  title: "Hard-wired dash camera from the cabin fuse box (Norvik Fjell F3)",
  summary:
    "Power a front dash camera from the Fjell F3's cabin fuse box with a piggyback fuse tap, routing the cable along the headliner and behind the A-pillar airbag.",
  category: "electronics",
  difficulty: 2,
  minutes: 75,
  author: "author@torqueleaf.test",
  state: "draft",
  changeSummary: "Work in progress: plug-in hybrid fuse numbers and photos for steps 2–5 still to come.",
  steps: [
    {
      title: "Plan the camera position and the cable route",
      body: doc(
        p(
          "Mount the camera behind the rear-view mirror, inside the area the wipers clear and clear of the mirror's sensor housing. The cable runs across the headliner to the passenger-side A-pillar, down the pillar ",
          b("behind"),
          " the curtain airbag, along the door seal to the cabin fuse box in the passenger footwell.",
        ),
        ul(
          "Clean the glass with alcohol before you stick the mount.",
          "Hold the camera in place and check the picture on your phone before the adhesive goes on.",
        ),
      ),
      liftsVehicle: false,
      disconnectsBattery: false,
      photos: [
        {
          file: "dashcam-windscreen.svg",
          alt: "A small dash camera behind a rear-view mirror with its cable tucked into the headliner edge",
          caption: "Camera behind the mirror, cable into the headliner.",
        },
      ],
      callouts: [
        {
          kind: "caution",
          signalWord: "WARNING",
          text: "The A-pillar trim covers a curtain airbag. Never route a cable in front of the airbag or fit anything to the pillar trim. Follow the vehicle maker's procedure for removing the trim, or leave airbag-area work to a qualified technician.",
        },
        {
          kind: "caution",
          signalWord: "WARNING",
          text: "On the hybrid and plug-in hybrid, the high-voltage system's orange cables run under the floor and rear seat. This install stays in the cabin fuse box: do not open, probe or tap into anything with an orange cable or a high-voltage label, and follow the vehicle maker's instructions.",
        },
      ],
    },
    {
      title: "Route the cable along the headliner and A-pillar",
      body: doc(
        ol(
          "Tuck the cable into the gap between the headliner and the windscreen with a plastic trim tool.",
          "At the pillar, pull the door seal back and release the top of the pillar trim only as far as the maker's procedure allows.",
          "Tie the cable to the existing harness behind the airbag with two ties, then down to the dashboard end.",
          "Run along the door seal channel to the footwell and refit the seal.",
        ),
      ),
      liftsVehicle: false,
      disconnectsBattery: false,
      photos: [],
      callouts: [],
    },
    {
      title: "Find a switched and a constant circuit",
      body: doc(
        p(
          "The hardwire kit has two feeds: ",
          b("ACC"),
          " (live only with the ignition on) and ",
          b("BATT"),
          " (always live, for parking mode). Remove the fuse box cover and use a test light, earthed to a body bolt, on both blades of candidate fuses.",
        ),
        ul(
          "For ACC, the front accessory socket fuse is a good choice on the F3.",
          "For BATT, the interior lamp fuse is live all the time.",
          "Never tap airbag, brake, steering or engine-management fuses.",
        ),
        p(
          "Fit a piggyback fuse tap in each slot: the original fuse goes in the lower position, the 3 A fuse for the camera in the upper. ",
          i("PHEV fuse positions to be confirmed."),
        ),
      ),
      liftsVehicle: false,
      disconnectsBattery: false,
      photos: [
        {
          file: "fuse-tap.svg",
          alt: "Piggyback fuse tap with two blade fuses in a fuse box",
          caption: "Original fuse below, 3 A camera fuse above.",
        },
      ],
      callouts: [
        {
          kind: "circuit",
          label: "Dash camera hardwire kit",
          systemVoltage: 12,
          loadAmps: 1,
          continuous: true,
          oneWayLengthM: 2.5,
          returnPath: "chassis",
          location: "cabin",
          insulationC: 105,
          bundled: 2,
          dropLimitPct: 10,
          wire: { awg: 18 },
          fuseA: 3,
          switchRatingA: 10,
          relay: false,
          feed: "fuse-box",
        },
      ],
    },
    {
      title: "Ground the kit and set the cut-off voltage",
      body: doc(
        ol(
          "Fit the kit's ground ring under the body bolt next to the fuse box, on bare metal with a serrated washer.",
          "Set the low-voltage cut-off to 12.2 V so parking mode never leaves the 12 V battery too low to start (or, on the hybrid, to go to READY).",
          "Crimp the tap leads to the kit's ACC and BATT wires.",
        ),
      ),
      liftsVehicle: false,
      disconnectsBattery: false,
      photos: [],
      callouts: [
        {
          kind: "tip",
          text: "A cut-off of 12.2 V is a good start; raise it to 12.4 V in cold weather or if the vehicle is parked for days.",
        },
      ],
    },
    {
      title: "Test and tidy",
      body: doc(
        ol(
          "Ignition on: the camera starts recording within a few seconds.",
          "Ignition off: the camera switches to parking mode.",
          "Coil the spare cable behind the fuse box cover, fix it with a tie and refit the cover.",
        ),
      ),
      liftsVehicle: false,
      disconnectsBattery: false,
      photos: [],
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
      note: "The plug-in hybrid's cabin fuse box has a different layout; fuse positions still to be confirmed.",
    },
  ],
  parts: [
    { name: "Front dash camera with adhesive mount", quantity: 1, partNumber: "DC-F1", step: 0 },
    { name: "Hardwire kit with low-voltage cut-off", quantity: 1, partNumber: "HW-LVC3", step: 3 },
    { name: "Piggyback fuse tap (mini blade)", quantity: 2, partNumber: "FT-MINI", step: 2 },
    { name: "Blade fuse, 3 A (mini)", quantity: 2, step: 2 },
    { name: "Cable ties, 100 mm", quantity: 6, step: 1 },
  ],
  tools: [{ name: "Plastic trim tool set" }, { name: "Test light" }, { name: "Ratchet crimper" }, { name: "10 mm socket" }],
} satisfies GuideSample;
