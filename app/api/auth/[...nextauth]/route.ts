import NextAuth from 'next-auth';
import { authOptions } from '@/lib/auth/options';

const handler = (req: Request, ctx: unknown) => NextAuth(authOptions())(req, ctx);

export { handler as GET, handler as POST };
