namespace Emit.Vectors;

/// <summary>What <see cref="VectorFields.Next"/> found.</summary>
internal enum VectorFieldKind
{
    /// <summary>No more fields on the line.</summary>
    End,

    /// <summary>A non-empty value.</summary>
    Value,

    /// <summary>Nothing between two commas.</summary>
    Empty,

    /// <summary>A comma at the end of the line.</summary>
    Trailing,
}
