/**
 * The trade's safety cautions, written once and shown both on the Cautions page and in
 * context (recording contamination, humidity treatments, drying, selling). Each defers to
 * local codes and licensed practice: Rhizomorph records yields; it is not safety advice.
 */
export const cautions = {
  spores: {
    title: "Moulds and spores",
    text: "Opening, moving or disposing of contaminated blocks, and long hours in a fruiting room, release mould and mushroom spores that can cause allergic and respiratory illness. Wear a well-fitted respirator of the class your local occupational-health rules call for, bag contaminated blocks before moving them, and keep them away from clean rooms.",
  },
  sterilisers: {
    title: "Sterilisers and pressure cookers",
    text: "Autoclaves, retorts and pressure cookers hold steam under pressure and scald. Never open one under pressure, keep safety valves and gaskets maintained and inspected, and follow the maker's instructions and your local pressure-vessel rules.",
  },
  humidifiers: {
    title: "Humidifiers and mains power",
    text: "Humidifiers, foggers and wet floors put water near mains power. Protect every circuit in a fruiting room with a residual-current (ground-fault) device, keep sockets and cables off wet surfaces, and have fixed wiring installed and checked by a licensed electrician to your local code.",
  },
  carbonDioxide: {
    title: "Carbon dioxide in closed rooms",
    text: "Growing mycelium and fruiting mushrooms give off carbon dioxide; a closed room can reach levels that cause headaches and, at worst, harm. Ventilate before going in, consider a CO2 monitor with an alarm, and follow local workplace exposure limits.",
  },
  alcoholCleaning: {
    title: "Cleaning with alcohol",
    text: "Alcohol used to wipe down a room, tub or tent gives off flammable vapour that can build up in a small closed space. Ventilate while and after you clean, keep flames, heaters, sparks and switching electrics away until the vapour has cleared, store it closed and away from heat, and follow the product's label and your local fire rules.",
  },
  roomCleaning: {
    title: "Mould and spores when cleaning a room",
    text: "Scrubbing or dry-brushing mouldy surfaces, filters and trays puts mould and mushroom spores in the air. Wear a well-fitted respirator of the class your local occupational-health rules call for, and gloves and eye protection for cleaning products; wet surfaces before wiping rather than brushing them dry, bag what you remove, and never mix cleaning products (bleach with acids or ammonia gives toxic gas).",
  },
  foodAndHealth: {
    title: "Selling food and health claims",
    text: "Selling fresh or dried mushrooms, and saying anything about their effect on health, is regulated. Follow your local food-safety, labelling and licensing rules. Nothing in Rhizomorph is medical or food-safety advice.",
  },
  pooledFigures: {
    title: "What a pooled figure means",
    text: "Farms differ in rooms, climate, spawn and handling more than strains often do. A pooled figure says how a strain did across the farms that reported it; your own rooms may differ.",
  },
} as const;

export type CautionKey = keyof typeof cautions;
