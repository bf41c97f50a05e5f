namespace ExprModel.Web.Workspace;

/// <summary>The part of the "why and what-if" area shown.</summary>
public enum WhatIfPart
{
    Knockdown,
    Sensitivity,
    Fit,
}
