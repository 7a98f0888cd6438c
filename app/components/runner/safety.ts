// The safety wording shown with every caution, in Cluepath's own words. It defers to training, the
// maker's instructions, local codes and licensed practice.
import type { Hazard } from "~/engine/types";

export const HAZARD_TITLE: Record<Hazard, string> = {
  electrical: "Line voltage",
  "stored-energy": "Stored charge",
  gas: "Gas",
  "hot-oil": "Hot oil",
  "hot-surface": "Hot surfaces",
  steam: "Steam",
  "moving-parts": "Moving parts",
  other: "Take care",
};

export const HAZARD_WORDING: Record<Hazard, string> = {
  electrical:
    "Line voltage can kill. Work on live circuits only if you are qualified and permitted to. Check your meter on a known live source, then prove the circuit dead before you touch it.",
  "stored-energy":
    "Capacitors keep their charge after the power is off. Discharge them with a rated discharge tool and confirm 0 V across the terminals. Never short them with a screwdriver.",
  gas: "Gas work is for qualified, licensed gas technicians. Shut the supply valve, leak-test every joint you disturb with an approved method, and ventilate before lighting.",
  "hot-oil": "Hot oil causes deep burns. Let it cool, or drain it into an approved container first. Never let water reach hot oil.",
  "hot-surface": "Surfaces stay hot long after switch-off. Let them cool or wear heat-rated gloves.",
  steam: "Steam burns without warning. Release the pressure and let the unit cool before opening it.",
  "moving-parts": "Fans and drives can start without warning. Lock out the power and keep hands clear until everything has stopped.",
  other: "Follow the precautions your shop sets for this work.",
};

export const DEFER_WORDING =
  "This reminder does not replace your training, the maker's service instructions, local codes or licensed practice. Where they ask for more, do what they ask.";
