import { Logo } from "@/components/shell/logo";

export default function AuthLayout({ children }: { children: React.ReactNode }) {
  return (
    <div className="grid min-h-screen lg:grid-cols-[minmax(0,5fr)_minmax(0,7fr)]">
      <aside className="relative hidden flex-col justify-between overflow-hidden bg-accent-900 p-10 text-accent-100 lg:flex">
        <Logo inverted />
        <div className="relative z-10 max-w-md">
          <p className="text-2xl font-semibold leading-snug text-white">
            Know the worst vapor each storeroom, refrigerator and cold room can make — before a hot day or a failed compressor does.
          </p>
          <p className="mt-4 text-sm leading-relaxed text-accent-200">
            Headroom keeps your inventory by location, tracks how warm each space really gets, and keeps a register of the
            findings that need someone&apos;s attention.
          </p>
        </div>
        <p className="relative z-10 max-w-md text-xs leading-relaxed text-accent-200/80">
          Screening estimates from physical models, not air monitoring. The local code and the authority having jurisdiction
          prevail; decisions belong to qualified people.
        </p>
        <svg aria-hidden="true" viewBox="0 0 400 300" className="absolute -right-10 bottom-24 w-[130%] opacity-20">
          <path d="M0 280 C 120 276, 200 250, 260 190 S 360 40, 400 10" fill="none" stroke="#b9dfe6" strokeWidth="2" />
          <path d="M0 200 H400" stroke="#b9dfe6" strokeDasharray="6 6" strokeWidth="1.5" />
        </svg>
      </aside>
      <main className="flex items-center justify-center px-5 py-12">
        <div className="w-full max-w-sm">
          <div className="mb-8 lg:hidden">
            <Logo />
          </div>
          {children}
        </div>
      </main>
    </div>
  );
}
