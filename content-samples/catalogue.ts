// The demo vehicle catalogue. Every make, model and variant is invented.
// batteryRunM is the approximate cable run from the 12 V battery to the
// firewall (bulkhead) pass-through, in metres.

export type Powertrain = "gas" | "diesel" | "hybrid" | "plug-in-hybrid" | "electric";
export type Drivetrain = "FWD" | "RWD" | "AWD" | "4WD";
export type BatteryLocation = "engine-bay" | "cargo-area" | "under-seat";

export type VariantSample = {
  key: string;
  name: string;
  powertrain: Powertrain;
  drivetrain: Drivetrain;
  batteryLocation: BatteryLocation;
  batteryRunM: number;
};

export type CatalogueSample = {
  makes: {
    name: string;
    slug: string;
    models: {
      name: string;
      slug: string;
      bodyStyle: string;
      generations: {
        name: string;
        slug: string;
        firstYear: number;
        lastYear: number | null;
        variants: VariantSample[];
      }[];
    }[];
  }[];
};

export const catalogue: CatalogueSample = {
  makes: [
    {
      name: "Norvik",
      slug: "norvik",
      models: [
        {
          name: "Fjell",
          slug: "fjell",
          bodyStyle: "compact SUV",
          generations: [
            {
              name: "F2",
              slug: "f2",
              firstYear: 2013,
              lastYear: 2018,
              variants: [
                {
                  key: "fjell-f2-gas-fwd",
                  name: "1.8 gas FWD",
                  powertrain: "gas",
                  drivetrain: "FWD",
                  batteryLocation: "engine-bay",
                  batteryRunM: 1.2,
                },
              ],
            },
            {
              name: "F3",
              slug: "f3",
              firstYear: 2019,
              lastYear: 2025,
              variants: [
                {
                  key: "fjell-f3-gas-fwd",
                  name: "2.0 gas FWD",
                  powertrain: "gas",
                  drivetrain: "FWD",
                  batteryLocation: "engine-bay",
                  batteryRunM: 1.1,
                },
                {
                  key: "fjell-f3-gas-awd",
                  name: "2.0 gas AWD",
                  powertrain: "gas",
                  drivetrain: "AWD",
                  batteryLocation: "engine-bay",
                  batteryRunM: 1.1,
                },
                {
                  key: "fjell-f3-hybrid-awd",
                  name: "2.0 hybrid AWD",
                  powertrain: "hybrid",
                  drivetrain: "AWD",
                  batteryLocation: "cargo-area",
                  batteryRunM: 4.5,
                },
                {
                  key: "fjell-f3-phev-awd",
                  name: "2.0 plug-in hybrid AWD",
                  powertrain: "plug-in-hybrid",
                  drivetrain: "AWD",
                  batteryLocation: "under-seat",
                  batteryRunM: 2.8,
                },
              ],
            },
          ],
        },
      ],
    },
    {
      name: "Calder",
      slug: "calder",
      models: [
        {
          name: "Kestrel",
          slug: "kestrel",
          bodyStyle: "mid-size pickup",
          generations: [
            {
              name: "K2",
              slug: "k2",
              firstYear: 2017,
              lastYear: 2023,
              variants: [
                {
                  key: "kestrel-k2-gas-rwd",
                  name: "3.6 gas RWD",
                  powertrain: "gas",
                  drivetrain: "RWD",
                  batteryLocation: "engine-bay",
                  batteryRunM: 0.9,
                },
                {
                  key: "kestrel-k2-gas-4wd",
                  name: "3.6 gas 4WD",
                  powertrain: "gas",
                  drivetrain: "4WD",
                  batteryLocation: "engine-bay",
                  batteryRunM: 0.9,
                },
                {
                  key: "kestrel-k2-diesel-4wd",
                  name: "2.8 diesel 4WD",
                  powertrain: "diesel",
                  drivetrain: "4WD",
                  batteryLocation: "engine-bay",
                  batteryRunM: 0.8,
                },
              ],
            },
            {
              name: "K3",
              slug: "k3",
              firstYear: 2024,
              lastYear: null,
              variants: [
                {
                  key: "kestrel-k3-gas-4wd",
                  name: "2.7 turbo gas 4WD",
                  powertrain: "gas",
                  drivetrain: "4WD",
                  batteryLocation: "engine-bay",
                  batteryRunM: 1.0,
                },
                {
                  key: "kestrel-k3-electric-4wd",
                  name: "Dual-motor electric 4WD",
                  powertrain: "electric",
                  drivetrain: "4WD",
                  batteryLocation: "under-seat",
                  batteryRunM: 2.4,
                },
              ],
            },
          ],
        },
      ],
    },
  ],
};

/** All variant keys, for checking that fitment rows point at real variants. */
export const variantKeys: string[] = catalogue.makes.flatMap((make) =>
  make.models.flatMap((model) => model.generations.flatMap((gen) => gen.variants.map((v) => v.key))),
);
