import { Link } from "react-router";
import { can, roleLabels } from "@shared/permissions";
import { PageHeader, Panel } from "@/components/ui/panel";
import { paths } from "@/config/paths";
import { useSignedInMe } from "@/app/use-signed-in-me";

/** What arrives next, stated plainly; no sample numbers until there are measurements to show. */
const upcoming = [
  {
    title: "Batch ledger",
    text: "Every unit of a batch with its fundamental, deviation in cents, overtone ratio, T60 and Q, and its verdict against the specification.",
  },
  {
    title: "Strike recording",
    text: "Upload a WAV file or record a strike in the browser; Tinelog finds each partial and fits its decay.",
  },
  {
    title: "Specifications",
    text: "Target pitch, overtone ratios and tolerances in cents for each product, versioned so batches keep the version they were made under.",
  },
  {
    title: "Certificates",
    text: "A test certificate per unit, e-mailed to the customer with a public verification link.",
  },
];

export function DashboardRoute() {
  const me = useSignedInMe();
  const { role, name } = me.activeWorkshop;

  return (
    <>
      <PageHeader title="Dashboard" description={`${name} · you work here as ${roleLabels[role] ?? role}.`} />
      <div className="grid items-start gap-6 lg:grid-cols-[1fr_20rem]">
        <Panel aria-labelledby="next-heading">
          <h2 id="next-heading" className="text-title font-semibold">
            What comes next
          </h2>
          <p className="mt-1 text-ink-soft">
            This workshop has no batches or measurements yet: the screens that record and judge them are the next to arrive. Open batches and
            units awaiting review will be listed here.
          </p>
          <ul className="mt-5 grid gap-4 sm:grid-cols-2">
            {upcoming.map((item) => (
              <li key={item.title} className="rounded-control border border-line bg-canvas p-4">
                <p className="font-semibold">{item.title}</p>
                <p className="mt-1 text-caption text-ink-soft">{item.text}</p>
              </li>
            ))}
          </ul>
        </Panel>
        <Panel aria-labelledby="now-heading">
          <h2 id="now-heading" className="text-title font-semibold">
            You can now
          </h2>
          <ul className="mt-3 flex flex-col gap-2">
            {can(role, "member", "create") ? (
              <li>
                <Link to={paths.app.members.getHref()} className="font-medium text-steel-700 underline underline-offset-2">
                  Invite makers and quality staff
                </Link>
              </li>
            ) : null}
            {can(role, "mail", "read") ? (
              <li>
                <Link to={paths.app.outbox.getHref()} className="font-medium text-steel-700 underline underline-offset-2">
                  Read the mail Tinelog has sent
                </Link>
              </li>
            ) : null}
            {me.workshops.length > 1 ? <li className="text-ink-soft">Switch workshop with the selector in the navigation.</li> : null}
            <li className="text-ink-soft">
              {can(role, "member", "create")
                ? "Set up your team now, so everyone can sign in when recording opens."
                : "Nothing to do yet: you will create batches and record strikes here once the ledger arrives."}
            </li>
          </ul>
        </Panel>
      </div>
    </>
  );
}
