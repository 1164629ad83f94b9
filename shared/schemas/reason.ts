import { z } from "zod";

/** Why a decision or a correction is made: at least 3 characters, recorded with the name of who made it. */
export const reasonSchema = z
  .string({ error: "Say why, in a few words." })
  .trim()
  .min(3, "Say why, in at least 3 characters.")
  .max(2000, "Keep the reason under 2000 characters.");
