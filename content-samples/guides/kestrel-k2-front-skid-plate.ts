import { b, doc, type GuideSample, i, ol, p, ul } from "../lib";

const standsCaution = {
  kind: "caution",
  signalWord: "WARNING",
  text: "Never work under a vehicle held only by a jack. Support it on a pair of rated jack stands at the vehicle maker's support points, on firm level ground, with the wheels that stay down chocked. Push the vehicle firmly before you get underneath; if anything moves, lower it and start again.",
} as const;

export default {
  slug: "kestrel-k2-front-skid-plate",
  title: "Front skid plate (Calder Kestrel K2 4WD)",
  summary:
    "Replace the Kestrel K2's plastic splash shield with a 5 mm steel skid plate that protects the front differential, sump and steering, bolted to the frame on new brackets.",
  category: "protection",
  difficulty: 3,
  minutes: 120,
  author: "author@torqueleaf.test",
  state: "published",
  changeSummary: "First published revision.",
  steps: [
    {
      title: "Prepare the truck and the work area",
      body: doc(
        ul(
          "Park on a level concrete floor, 4WD disengaged, transmission in park (or first gear), parking brake on.",
          "Chock both rear wheels front and back.",
          "Let the engine cool: the sump and the front exhaust pipe are close to the plate.",
          "Unpack the plate and check it against the parts list. It weighs 14 kg: plan on a helper or a trolley jack to lift it.",
        ),
        p("Wear safety glasses: you will be under the truck and rust and grit will fall."),
      ),
      liftsVehicle: false,
      disconnectsBattery: false,
      photos: [
        {
          file: "skid-plate-under-chassis.svg",
          alt: "Underside view of a pickup's front with a steel skid plate between the frame rails",
          caption: "The finished plate covers the sump, front differential and steering rack.",
        },
      ],
      // The support warning is read before the step that lifts the truck, and again in it.
      callouts: [
        standsCaution,
        {
          kind: "tip",
          text: "Spray the splash-shield bolts and the frame's threaded holes with penetrating oil the evening before.",
        },
      ],
    },
    {
      title: "Raise the front and support it on jack stands",
      body: doc(
        ol(
          "Place the trolley jack under the front crossmember's lifting pad (the flat, reinforced area marked in the owner's manual).",
          "Raise the front until the tyres are about 50 mm off the floor.",
          "Set a stand under each frame rail just behind the front suspension mounts, at the same height, with the locking pins fully in.",
          "Lower the jack slowly until the frame rests on both stands, then leave the jack just touching as a backup, not holding load.",
          "Push the truck firmly at the fender. Nothing should move.",
        ),
      ),
      liftsVehicle: true,
      disconnectsBattery: false,
      photos: [
        {
          file: "jack-stands-frame.svg",
          alt: "A pickup's front frame rail resting on a jack stand, with a trolley jack below the crossmember",
          caption: "Stands under both frame rails; the jack stays in place only as a backup.",
        },
      ],
      callouts: [
        standsCaution,
        {
          kind: "caution",
          signalWord: "CAUTION",
          text: "Use jack stands rated for at least the front axle load on the door-pillar label (a pair rated 3 t is a sensible minimum for a K2). Never stack stands or use blocks, bricks or wheels instead.",
        },
      ],
    },
    {
      title: "Remove the factory splash shield",
      body: doc(
        p(
          "The plastic shield hangs from six M6 bolts and two push clips. Remove the bolts at the rear first and the front last, and support the shield as the last bolt comes out.",
        ),
        p(i("Keep the bolts: the new plate uses its own, but the shield can go back on if you ever remove the plate.")),
      ),
      liftsVehicle: false,
      disconnectsBattery: false,
      photos: [],
      callouts: [],
    },
    {
      title: "Fit the rear mounting brackets",
      body: doc(
        p(
          "Two L-shaped brackets bolt to the threaded holes on the inside face of each frame rail, just ahead of the transmission crossmember. They carry the plate's rear edge.",
        ),
        ol(
          "Clean the threads with a thread chaser (not a cutting tap) and blow them out.",
          "Put a drop of medium-strength threadlocker on each bolt.",
          "Fit each bracket with the short leg pointing down and the slotted hole to the rear. Start all bolts by hand.",
          "Torque the bracket bolts.",
        ),
      ),
      liftsVehicle: false,
      disconnectsBattery: false,
      photos: [
        {
          file: "skid-plate-brackets.svg",
          alt: "An L-shaped steel bracket bolted to the inside of a frame rail with two bolts",
          caption: "Rear bracket on the inside of the frame rail.",
        },
      ],
      callouts: [
        {
          kind: "torque",
          fastener: "Rear bracket to frame rail",
          valueSource: "vehicle-maker",
          value: 45,
          unit: "N·m",
          size: "M10",
          propertyClass: "8.8",
          threadlocker: "medium-strength, removable",
        },
        {
          kind: "torque",
          fastener: "Bracket gusset nut (kit hardware; the kit maker gives no value)",
          valueSource: "estimate",
          size: "M8",
          propertyClass: "8.8",
          estimate: true,
        },
      ],
    },
    {
      title: "Lift the plate into place",
      body: doc(
        ol(
          "Lay a board across the trolley jack's saddle and set the plate on it, front edge forward.",
          "Raise it slowly until the front holes line up with the captive nuts in the front crossmember. Your helper guides it from the side; keep fingers out of the gap between plate and frame.",
          "Start both front M10 bolts by hand, then the four M8 bolts into the rear brackets.",
          "Only when all six are started, lower the jack away.",
        ),
      ),
      liftsVehicle: false,
      disconnectsBattery: false,
      photos: [
        {
          file: "skid-plate-under-chassis.svg",
          alt: "Skid plate being raised under a pickup on a trolley jack",
          caption: "Start every bolt by hand before you lower the jack.",
        },
      ],
      callouts: [
        {
          kind: "caution",
          signalWord: "CAUTION",
          text: "The plate is heavy and its edges are sharp. Wear gloves and safety glasses and keep hands out of pinch points between the plate and the frame.",
        },
      ],
    },
    {
      title: "Torque the plate bolts",
      body: doc(
        p("Tighten the front bolts first so the plate hangs from its strongest point, then the rear ones."),
        ul(
          [b("Front (2 × M10)"), " into the crossmember's captive nuts."],
          [b("Rear (4 × M8)"), " into the brackets, through the slots."],
        ),
      ),
      liftsVehicle: false,
      disconnectsBattery: false,
      photos: [
        {
          file: "torque-wrench-bolt.svg",
          alt: "Torque wrench on a skid plate bolt",
          caption: "Front bolts first, then the rear ones.",
        },
      ],
      callouts: [
        {
          kind: "torque",
          fastener: "Skid plate front bolt",
          valueSource: "accessory-maker",
          value: 40,
          unit: "N·m",
          size: "M10",
          propertyClass: "8.8",
        },
        {
          kind: "torque",
          fastener: "Skid plate rear bolt",
          valueSource: "accessory-maker",
          value: 25,
          unit: "N·m",
          size: "M8",
          propertyClass: "8.8",
        },
        {
          kind: "tip",
          text: "The values are for this plate's hardware. Where the vehicle maker gives a value for the crossmember or frame bolts, the maker's value governs.",
        },
      ],
    },
    {
      title: "Check clearances",
      body: doc(
        ul(
          "Turn the steering from lock to lock (the front wheels are off the ground): nothing may touch the plate.",
          "Check the front differential breather hose and the oil cooler lines are not pinched.",
          "The oil filter and sump plug must line up with the plate's access panels. Open them once to check.",
          "Tap the plate all over with a mallet and listen for rattles.",
        ),
      ),
      liftsVehicle: false,
      disconnectsBattery: false,
      photos: [],
      callouts: [],
    },
    {
      title: "Lower the truck and re-check",
      body: doc(
        ol(
          "Raise the front on the jack just enough to take the weight off the stands; remove the stands.",
          "Lower the truck slowly, with everyone clear of the front.",
          "Re-check the bolt torque after the first off-road trip or 500 km, whichever comes first.",
        ),
      ),
      liftsVehicle: true,
      disconnectsBattery: false,
      photos: [
        {
          file: "jack-stands-frame.svg",
          alt: "Jack stands beside a pickup's frame being removed",
          caption: "Take the weight on the jack, then remove the stands.",
        },
      ],
      callouts: [standsCaution],
    },
  ],
  fitment: [
    { variant: "kestrel-k2-gas-4wd", status: "fits" },
    {
      variant: "kestrel-k2-diesel-4wd",
      status: "fits-with-changes",
      note: "The diesel's sump sits 20 mm lower: fit the 20 mm spacer set (SP-20) between the rear brackets and the plate, and use the left access panel for the oil filter.",
    },
    {
      variant: "kestrel-k2-gas-rwd",
      status: "fits-with-changes",
      note: "No front differential: the plate fits, but the RWD frame has no threaded holes for the rear brackets. Use the clamp-on bracket kit (CB-K2R).",
    },
    {
      variant: "kestrel-k3-gas-4wd",
      status: "does-not-fit",
      note: "The K3 has a different front crossmember.",
    },
    {
      variant: "kestrel-k3-electric-4wd",
      status: "does-not-fit",
      note: "The electric K3 has a front drive unit and its own factory underbody shield.",
    },
  ],
  parts: [
    { name: "Front skid plate, 5 mm steel, with access panels", quantity: 1, partNumber: "SK-K2F-5", step: 4 },
    { name: "Rear mounting bracket pair", quantity: 1, partNumber: "SK-K2-BR", step: 3 },
    {
      name: "Bolt M10 × 30, class 8.8, with hardened washers",
      quantity: 6,
      notes: "Four for the brackets, two for the plate front.",
      step: 3,
    },
    { name: "Bolt M8 × 25, class 8.8, with hardened washers", quantity: 4, step: 4 },
    { name: "Medium-strength threadlocker", quantity: 1, step: 3 },
  ],
  tools: [
    { name: "Trolley jack" },
    { name: "Jack stands rated 3 t, pair" },
    { name: "Wheel chocks" },
    { name: "Torque wrench, 20–100 N·m" },
    { name: "13 mm and 15 mm sockets" },
    { name: "Thread chaser set" },
    { name: "Safety glasses and gloves" },
  ],
} satisfies GuideSample;
