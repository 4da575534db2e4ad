import { describe, expect, it } from "vitest";
import { readDateCell, readMassCell, readMoistureCell, readNumberCell, readRoomCell, readYesNoCell, roomKey } from "./cells";

describe("the import's rules for one cell, for any way a value comes in", () => {
  it("reads a mass, keeps it as written, and refuses what the importer refuses, by code", () => {
    // 1 lb 2 oz = 18 × 28.349523125 g (NIST Handbook 44, Appendix C).
    const compound = readMassCell(" 1 lb 2 oz ", { kind: "fresh" });
    expect("value" in compound && compound.value.written).toEqual({ value: "1 lb 2 oz", unit: "lb+oz" });
    expect("value" in compound && compound.value.grams).toBeCloseTo(510.29141625, 8);
    expect(readMassCell("12", { kind: "fresh", unit: "oz" })).toMatchObject({ value: { written: { value: "12", unit: "oz" } } });
    expect(readMassCell("12", { kind: "fresh" })).toMatchObject({ code: "mass_without_unit" });
    expect(readMassCell("2.720 g", { kind: "wet" })).toMatchObject({ code: "ambiguous_decimal_mark" });
    expect(readMassCell("2.720 g", { kind: "wet", decimal: "," })).toMatchObject({ value: { grams: 2720 } });
    expect(readMassCell("0.612 kg", { kind: "fresh" })).toMatchObject({ value: { grams: 612 } });
    // 60 lb (27.2 kg) is over the 25 kg one flush can weigh; a 50 lb flush on a 5 lb block is caught against the block, not here.
    expect(readMassCell("60 lb", { kind: "fresh" })).toMatchObject({ code: "mass_implausible" });
    expect(readMassCell("50 lb", { kind: "fresh" })).toMatchObject({ value: { written: { unit: "lb" } } });
    expect(readMassCell("5 lb", { kind: "wet" })).toMatchObject({ value: { written: { unit: "lb" } } });
    expect(readMassCell("3 ozt", { kind: "fresh" })).toMatchObject({ code: "troy_ounce" });
  });

  it("reads a date or date-time, asks for the order when it reads two ways, and warns of a future date", () => {
    expect(readDateCell("03/21/26 08:30 AM")).toEqual({ value: "2026-03-21" });
    expect(readDateCell("03/04/2026")).toMatchObject({ code: "ambiguous_date_order" });
    expect(readDateCell("03/04/2026", { order: "dmy" })).toEqual({ value: "2026-04-03" });
    expect(readDateCell("21.03.2026", { order: "mdy" })).toMatchObject({ code: "date_wrong_order" });
    expect(readDateCell("2026-12-24", { today: "2026-12-02" })).toMatchObject({ value: "2026-12-24", warning: { code: "date_in_future" } });
    expect(readDateCell("31.02.2026")).toMatchObject({ code: "date_not_in_calendar" });
  });

  it("reads yes/no in other languages, a number with a known mark, and a moisture", () => {
    expect(readYesNoCell("nein")).toEqual({ value: false });
    expect(readYesNoCell("VRAI")).toEqual({ value: true });
    expect(readYesNoCell("vielleicht")).toMatchObject({ code: "not_yes_or_no" });
    expect(readNumberCell("1.234,5", ",")).toEqual({ value: 1234.5 });
    expect(readNumberCell("0.612", ",")).toEqual({ value: 0.612 });
    expect(readNumberCell("1.2.3", ".")).toMatchObject({ code: "number_unreadable" });
    expect(readMoistureCell("62,5 %")).toEqual({ value: 0.625 });
    expect(readMoistureCell("62.500 %")).toEqual({ value: 0.625 });
    expect(readMoistureCell("162 %")).toMatchObject({ code: "moisture_out_of_range" });
  });
});

describe("a fruiting-room cell, against the farm's own rooms", () => {
  const rooms = [
    { id: "r-1", name: "Tent 1" },
    { id: "r-2", name: "Back room" },
  ];

  it("names a room whatever its capitals and spaces; a blank cell names none", () => {
    for (const written of ["Tent 1", "tent1", " TENT  1 ", "tent\u00a01"])
      expect(readRoomCell(written, rooms), written).toEqual({ value: rooms[0] });
    expect(readRoomCell("backroom", rooms)).toEqual({ value: rooms[1] });
    expect(roomKey("Back Room")).toBe(roomKey("backroom"));
    expect(readRoomCell("", rooms)).toBeNull();
    expect(readRoomCell("   ", rooms)).toBeNull();
  });

  it("never guesses: a near name, or punctuation the room's name lacks, is another room", () => {
    for (const written of ["Tent 2", "Tent-1", "Tnet 1", "Tent"]) {
      const reading = readRoomCell(written, rooms);
      expect(reading, written).toMatchObject({ code: "unknown_fruiting_room" });
      expect(reading && "message" in reading ? reading.message : "").toContain('"Back room", "Tent 1"');
    }
    expect(readRoomCell("Tent 1", [])).toMatchObject({
      code: "unknown_fruiting_room",
      message: expect.stringContaining("no rooms recorded yet") as unknown,
    });
  });

  it("refuses a name two rooms share once capitals and spaces are ignored", () => {
    const reading = readRoomCell("tent 1", [...rooms, { id: "r-3", name: "TENT 1" }]);
    expect(reading).toMatchObject({ code: "fruiting_room_ambiguous" });
    expect(reading && "message" in reading ? reading.message : "").toContain('"Tent 1", "TENT 1"');
  });

  it("lists a farm's first dozen rooms and how many more", () => {
    const many = Array.from({ length: 15 }, (_, index) => ({ id: `r-${index}`, name: `Tub ${String(index + 10)}` }));
    const reading = readRoomCell("Tent 1", many);
    expect(reading && "message" in reading ? reading.message : "").toContain('"Tub 21" and 3 more');
  });
});
