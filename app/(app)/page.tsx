import { redirect } from "next/navigation";
import { currentMember } from "@/lib/auth/guard";
import { homePathFor } from "@/lib/navigation";

export default async function HomePage() {
  const member = await currentMember();
  redirect(member ? homePathFor(member.role) : "/sign-in");
}
