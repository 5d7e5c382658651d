import { b, doc, type GuideSample, ol, p, ul } from "../lib";

// In review on purpose: the editor should find that the battery is never
// disconnected before the battery-fed circuit is wired (battery-disconnect-
// missing), and that the 15 A fuse is slightly above the 14 A ampacity of
// 18 AWG in a three-conductor bundle (fuse-above-ampacity). Neither is
// blocking; the cautions still need an editor's sign-off.

export default {
  slug: "fjell-phev-rear-usb-charger",
  title: "USB-C charger for the rear seats (Norvik Fjell F3 plug-in hybrid)",
  summary:
    "Fit a two-port 60 W USB-C charger in the back of the Fjell F3 plug-in hybrid's centre console, fed from the 12 V battery under the rear seat.",
  category: "power",
  difficulty: 2,
  minutes: 90,
  author: "author@torqueleaf.test",
  state: "in-review",
  changeSummary: "First submission: rear USB-C charger for the plug-in hybrid.",
  steps: [
    {
      title: "Read the high-voltage precautions",
      body: doc(
        p(
          "On the plug-in hybrid the 12 V battery sits under the rear seat cushion, on the right, only a short way from the traction battery's orange cables. The charger circuit is short, but it is worked on close to the ",
          b("high-voltage system"),
          ".",
        ),
        ul(
          "Switch the vehicle off and unplug the charging cable from the charge port.",
          "Keep the key fob at least 5 m away so the vehicle cannot be switched on by accident.",
          "Identify every orange cable before you start, and keep your new wires on the opposite side of the seat frame.",
        ),
      ),
      liftsVehicle: false,
      disconnectsBattery: false,
      photos: [
        {
          file: "hv-cable-warning.svg",
          alt: "Orange high-voltage cable with a warning triangle beside it",
          caption: "Know where the orange cables are before you start.",
        },
      ],
      callouts: [
        {
          kind: "caution",
          signalWord: "WARNING",
          text: "The plug-in hybrid's high-voltage system can cause severe burns or death. Do not touch, move or tie anything to orange cables or parts with high-voltage labels. Switch the vehicle off, unplug the charge cable and follow the vehicle maker's procedure; high-voltage work is for trained, certified technicians only.",
        },
      ],
    },
    {
      title: "Remove the rear seat cushion",
      body: doc(
        ol(
          "Pull up sharply at the front edge of the cushion on each side to release the two hooks.",
          "Lift the cushion forward and out, unplugging the seat-heater connector underneath.",
          "Set it on a clean surface. The 12 V battery is now visible in its tray on the right.",
        ),
      ),
      liftsVehicle: false,
      disconnectsBattery: false,
      photos: [],
      callouts: [],
    },
    {
      title: "Cut the opening in the console end panel",
      body: doc(
        ol(
          "Unclip the rear end panel of the centre console (four clips, start at the bottom).",
          "Mark a 60 × 32 mm rectangle centred 40 mm below the air vent.",
          "Drill the corners with a 6 mm bit, cut between them with a fine saw and file the edges to the template.",
          "Press the charger in from the front until its clips snap behind the panel.",
        ),
      ),
      liftsVehicle: false,
      disconnectsBattery: false,
      photos: [
        {
          file: "usb-charger-console.svg",
          alt: "A two-port USB-C charger set into the rear end of a centre console below an air vent",
          caption: "Charger centred below the rear vent.",
        },
      ],
      callouts: [],
    },
    {
      title: "Fit the fuse holder at the battery and connect the feed",
      body: doc(
        p(
          "Working carefully with insulated tools, fit the inline fuse holder's ring terminal to the accessory stud of the positive clamp. Keep the fuse out until the end. The holder sits 150 mm from the terminal.",
        ),
        ul(
          "Red 18 AWG from the fuse holder to the charger's + terminal.",
          "Black 18 AWG from the charger's − terminal back to the battery's negative stud.",
          "The charger has its own touch switch and draws almost nothing when off.",
        ),
      ),
      liftsVehicle: false,
      disconnectsBattery: false,
      photos: [
        {
          file: "fuse-holder-battery.svg",
          alt: "Inline fuse holder close to a battery positive terminal",
          caption: "Fuse holder 150 mm from the positive terminal.",
        },
      ],
      callouts: [
        {
          kind: "circuit",
          label: "Rear USB-C charger feed (60 W output)",
          systemVoltage: 12,
          loadWatts: 66,
          continuous: true,
          oneWayLengthM: 1.8,
          returnPath: "wire",
          location: "cabin",
          insulationC: 105,
          bundled: 3,
          dropLimitPct: 10,
          wire: { awg: 18 },
          fuseA: 15,
          fuseDistanceMm: 150,
          switchRatingA: 10,
          relay: false,
          feed: "battery",
        },
      ],
    },
    {
      title: "Route the wires under the console",
      body: doc(
        ul(
          "Run the red and black pair forward from the battery tray under the carpet edge to the console.",
          "Tie it to the seat-heater feed along the floor tunnel with ties every 150 mm.",
          "Keep it clear of the seat hooks and of the seat-belt buckle anchors.",
        ),
      ),
      liftsVehicle: false,
      disconnectsBattery: false,
      photos: [],
      callouts: [
        {
          kind: "tip",
          text: "Leave 100 mm of slack at the console so the end panel can come off again without unplugging the charger.",
        },
      ],
    },
    {
      title: "Test and refit",
      body: doc(
        ol(
          "Fit the fuse and touch the charger's switch: the ring light should come on.",
          "Check both ports with a phone and with a laptop that charges from USB-C.",
          "Refit the console end panel, plug in the seat-heater connector and refit the cushion until both hooks click.",
        ),
      ),
      liftsVehicle: false,
      disconnectsBattery: false,
      photos: [
        {
          file: "usb-charger-console.svg",
          alt: "USB-C charger lit up in the rear console",
          caption: "Both ports tested before the cushion goes back.",
        },
      ],
      callouts: [
        {
          kind: "caution",
          signalWord: "CAUTION",
          text: "Check the seat hooks have not trapped the new wires before refitting the cushion. Follow the vehicle maker's instructions and local codes.",
        },
      ],
    },
  ],
  fitment: [
    { variant: "fjell-f3-phev-awd", status: "fits" },
    {
      variant: "fjell-f3-hybrid-awd",
      status: "fits-with-changes",
      note: "Battery in the cargo area: feed from there and run about 2.5 m forward under the left sill trim.",
    },
    {
      variant: "fjell-f3-gas-awd",
      status: "fits-with-changes",
      note: "Battery in the engine bay: take the feed from the cabin fuse box with a piggyback fuse tap instead.",
    },
  ],
  parts: [
    { name: "Two-port USB-C charger, 60 W total, 12 V input", quantity: 1, partNumber: "UC-60D", step: 2 },
    { name: "Inline blade fuse holder, 18 AWG leads", quantity: 1, partNumber: "FH-18", step: 3 },
    { name: "Blade fuse, 15 A", quantity: 1, step: 3 },
    { name: "Wire, 18 AWG, red and black pair", quantity: 2, notes: "Metres.", step: 3 },
    { name: "Cable ties, 150 mm", quantity: 15, step: 4 },
  ],
  tools: [
    { name: "Plastic trim tool set" },
    { name: "Drill with 6 mm bit" },
    { name: "Fine saw and flat file" },
    { name: "Insulated screwdriver and 10 mm spanner" },
    { name: "Ratchet crimper" },
  ],
} satisfies GuideSample;
