export default function PublicLayout({ children }: { children: React.ReactNode }) {
  return (
    <div className="min-h-screen bg-board-900 text-chalk">
      <main id="main" className="mx-auto flex min-h-screen max-w-md flex-col justify-center px-5 py-10">
        {children}
      </main>
    </div>
  );
}
