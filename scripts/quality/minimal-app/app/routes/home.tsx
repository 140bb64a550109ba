// A page of about the shape of a small real one (header, a list, a footer) with no data.
export function meta() {
  return [{ title: "Minimal page" }];
}

const ITEMS = ["First item", "Second item", "Third item", "Fourth item", "Fifth item"];

export default function Home() {
  return (
    <main>
      <h1>Minimal React Router page</h1>
      <p>The framework's own floor for a server-rendered page, for comparison in the load benchmark.</p>
      <ul>
        {ITEMS.map((i) => (
          <li key={i}>{i}</li>
        ))}
      </ul>
      <footer>Nothing here touches a database.</footer>
    </main>
  );
}
