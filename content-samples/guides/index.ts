import type { GuideSample } from "../lib";
import fjellHybridCargoOutlet from "./fjell-hybrid-cargo-12v-outlet";
import fjellHardwiredDashCamera from "./fjell-f3-hardwired-dash-camera";
import fjellPhevRearUsbCharger from "./fjell-phev-rear-usb-charger";
import fjellRoofCrossbars from "./fjell-f3-roof-crossbars";
import kestrelFrontSkidPlate from "./kestrel-k2-front-skid-plate";
import kestrelHoodAuxiliaryLamps from "./kestrel-hood-auxiliary-lamps";
import kestrelRearRecoveryPoints from "./kestrel-rear-recovery-points";

// Published guides first (in the order the demo walks through them), then the
// one waiting in the review queue, then the author's draft.
export const guides: GuideSample[] = [
  kestrelHoodAuxiliaryLamps,
  fjellHybridCargoOutlet,
  fjellRoofCrossbars,
  kestrelFrontSkidPlate,
  kestrelRearRecoveryPoints,
  fjellPhevRearUsbCharger,
  fjellHardwiredDashCamera,
];
