global using System.Runtime.CompilerServices;
