import { personSchema, type Person } from "@tributary/contracts";
import { queryOptions, useQuery } from "@tanstack/react-query";
import { z } from "zod";
import { api } from "../../../lib/api-client";

/** GET /api/people: everyone with an account, their role and markets (admins). */
export function getPeople(): Promise<Person[]> {
  return api.get("/api/people", z.array(personSchema));
}

export const peopleQueryOptions = () => queryOptions({ queryKey: ["people"] as const, queryFn: getPeople });

export function usePeople() {
  return useQuery(peopleQueryOptions());
}
