/**
 * One static page of about 21 KB of HTML (document, hydration scripts and this text together), the
 * size of a guide page, with no loader and no data: what the framework alone costs per request.
 */
export function meta() {
  return [{ title: "Bare page" }];
}

const SENTENCE =
  "Route the feed along the existing loom, keep it clear of hot and moving parts, and fasten it every thirty centimetres. ";

const SECTIONS = Array.from({ length: 28 }, (_, i) => ({
  id: i + 1,
  heading: `Section ${i + 1}`,
  paragraphs: [SENTENCE.repeat(3), SENTENCE.repeat(2)],
}));

export default function Home() {
  return (
    <main>
      <h1>Bare page</h1>
      {SECTIONS.map((section) => (
        <section key={section.id}>
          <h2>{section.heading}</h2>
          {section.paragraphs.map((text, i) => (
            <p key={i}>{text}</p>
          ))}
        </section>
      ))}
    </main>
  );
}
