import { z } from "zod";
import { id, optionalId, optionalIsoDate, requiredText } from "./common";

const seasonFields = z.object({
  name: requiredText("the season's name", 80, 2),
  year: z.coerce
    .number({ error: "Enter the year as four digits, like 2027." })
    .int("Enter the year as four digits, like 2027.")
    .min(2000, "Enter a year from 2000 to 2100.")
    .max(2100, "Enter a year from 2000 to 2100."),
  startsOn: optionalIsoDate("Enter the first day like 2027-03-01, or leave it empty."),
  endsOn: optionalIsoDate("Enter the last day like 2027-10-31, or leave it empty."),
});

// ISO dates compare correctly as text.
const endNotBeforeStart = (v: { startsOn?: string; endsOn?: string }) => !v.startsOn || !v.endsOn || v.endsOn >= v.startsOn;
const endMessage = { path: ["endsOn"], message: "The last day comes before the first day. Check both dates." };

// Left out when the viewer runs one program: the season then joins that program.
export const newSeasonSchema = seasonFields.extend({ programId: optionalId("Choose the program.") }).refine(endNotBeforeStart, endMessage);

export const editSeasonSchema = seasonFields.extend({ seasonId: id("Choose a season from the list.") }).refine(endNotBeforeStart, endMessage);

export const seasonClosedSchema = z.object({
  seasonId: id("Choose a season from the list."),
  closed: z.enum(["true", "false"]).transform((v) => v === "true"),
});

export type SeasonInput = z.infer<typeof seasonFields>;
