// Demo accounts. All names and shops are invented. Passwords are set by the seed.

export type PersonSample = {
  email: string;
  name: string;
  role: "admin" | "editor" | "author" | "reader";
  bio?: string;
};

export const people: PersonSample[] = [
  {
    email: "admin@torqueleaf.test",
    name: "Ines Marlowe",
    role: "admin",
    bio: "Keeps the vehicle catalogue tidy and the accounts in order.",
  },
  {
    email: "editor@torqueleaf.test",
    name: "Tomasz Okafor-Lind",
    role: "editor",
    bio: "Former auto-electrician. Reviews every circuit, caution and lifting step before a guide goes live.",
  },
  {
    email: "author@torqueleaf.test",
    name: "Rhea Castellane",
    role: "author",
    bio: "Weekend overlander with a Kestrel K2 and a garage full of offcuts of 12 AWG wire.",
  },
  {
    email: "author2@torqueleaf.test",
    name: "Dev Arkwright",
    role: "author",
    bio: "Lead technician at Fernbrook Auto Fitting, an invented two-bay accessory shop. Fits racks and power outlets most days.",
  },
  {
    email: "reader@torqueleaf.test",
    name: "Mina Solberg",
    role: "reader",
    bio: "Drives a Fjell F3 hybrid and wants a 12 V outlet for a cool box.",
  },
];
